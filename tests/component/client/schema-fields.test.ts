// The objective forms come from the objective schemas: every kind yields fields, enums become choices in
// words, optional numbers stay optional, and every field is either described or drawn by a picker.
import { describe, expect, it } from 'vitest'
import { z } from 'zod'
import { OBJECTIVE_KINDS, objectiveSchema } from '@shared/scenario/objectiveSchema'
import {
  CHOICE_WORDS,
  newObjective,
  objectiveFields,
  objectiveKindSchema,
  schemaFields,
} from '@/components/scenarios/editor/schemaFields'
import { motorNameplateSchema } from '@shared/model/setup'
import { nameplateProblems } from '@shared/model/nameplate'
import {
  benchNameplate,
  NAMEPLATE_CHOICE_WORDS,
  NAMEPLATE_FIELDS,
} from '@/components/scenarios/editor/nameplateFields'

describe('schemaFields', () => {
  it('gives every objective kind its title and points, and leaves no field of any kind out', () => {
    for (const kind of OBJECTIVE_KINDS) {
      const { fields, unsupported } = schemaFields(kind, objectiveKindSchema(kind))
      expect(unsupported, kind).toEqual([])
      const keys = fields.map((f) => f.key)
      expect(keys, kind).toEqual(expect.arrayContaining(['title', 'weight', 'required', 'hints']))
      // The id and kind are the form's business, never a field.
      expect(keys).not.toContain('id')
      expect(keys).not.toContain('kind')
      // Every key of the schema but id and kind has a field.
      const shapeKeys = Object.keys(objectiveKindSchema(kind).shape).filter((k) => k !== 'id' && k !== 'kind')
      expect(keys.sort(), kind).toEqual(shapeKeys.sort())
    }
  })

  it('reads numbers with their bounds and optional numbers as optional', () => {
    const weight = objectiveFields('speedHeld').find((f) => f.key === 'weight')
    expect(weight).toMatchObject({ type: 'number', optional: false, min: 0, minExclusive: true })
    const from = objectiveFields('stoppedBy').find((f) => f.key === 'fromAtLeastHz')
    expect(from).toMatchObject({ type: 'number', optional: true, min: 0, minExclusive: false })
  })

  it('turns enums into choices in words', () => {
    const unit = objectiveFields('speedHeld').find((f) => f.key === 'unit')
    expect(unit).toMatchObject({ type: 'choice', optional: false })
    expect(unit?.type === 'choice' && unit.choices).toEqual([
      { value: 'rpm', title: 'rev/min' },
      { value: 'Hz', title: 'Hz' },
    ])
    const mode = objectiveFields('stoppedBy').find((f) => f.key === 'mode')
    expect(mode?.type === 'choice' && mode.choices.map((c) => c.title)).toEqual(['Ramping down', 'Coasting'])
  })

  it('has words for every enum value of every objective kind', () => {
    for (const kind of OBJECTIVE_KINDS)
      for (const field of objectiveFields(kind))
        if (field.type === 'choice')
          for (const choice of field.choices)
            expect(CHOICE_WORDS[String(choice.value)], `${kind}.${field.key}`).toBeTruthy()
  })

  it('marks the fields that name a setting, a device, a fault or hints for a picker', () => {
    const pickerOf = (kind: (typeof OBJECTIVE_KINDS)[number], key: string) => {
      const f = objectiveFields(kind).find((x) => x.key === key)
      return f?.type === 'picker' ? f.picker : f?.type
    }
    expect(pickerOf('settingEquals', 'key')).toBe('setting')
    expect(pickerOf('settingEquals', 'value')).toBe('settingValue')
    expect(pickerOf('settingInRange', 'min')).toBe('settingValue')
    expect(pickerOf('functionalCheck', 'device')).toBe('device')
    expect(pickerOf('faultFoundAndCleared', 'fault')).toBe('fault')
    expect(pickerOf('wiringCondition', 'input')).toBe('inputSelector')
    expect(pickerOf('wiringCondition', 'expect')).toBe('wiringExpect')
    expect(pickerOf('diagnosisCorrect', 'expect')).toBe('diagnosisExpect')
    expect(pickerOf('noAlarms', 'hints')).toBe('hints')
    // A plain number stays a number field where no picker is named.
    expect(pickerOf('speedHeld', 'target')).toBe('number')
  })

  it('reads a schema it has never seen', () => {
    const { fields, unsupported } = schemaFields(
      'made-up',
      z.object({ count: z.number().int().min(1).max(9).optional(), on: z.boolean(), odd: z.date() }),
    )
    expect(fields).toEqual([
      {
        key: 'count',
        label: 'Count',
        optional: true,
        type: 'number',
        min: 1,
        max: 9,
        minExclusive: false,
        integer: true,
      },
      { key: 'on', label: 'On', optional: false, type: 'boolean' },
    ])
    expect(unsupported).toEqual(['odd'])
  })

  it('starts a new objective that the schema accepts once its empty fields are filled', () => {
    const objective = newObjective('stoppedBy', 'objective1', 'Stopped by ramping down')
    expect(objective).toMatchObject({ kind: 'stoppedBy', mode: 'ramp', weight: 10 })
    expect(objectiveSchema.safeParse(objective).success).toBe(true)
    const speed = newObjective('speedHeld', 'objective2', 'Held at 40 Hz')
    expect(objectiveSchema.safeParse(speed).success).toBe(false)
    expect(objectiveSchema.safeParse({ ...speed, target: 40, tolerance: 1, holdSeconds: 5 }).success).toBe(
      true,
    )
  })

  it('reads a choice written as a union of literals', () => {
    const { fields, unsupported } = schemaFields(
      'made-up',
      z.object({ hz: z.union([z.literal(50), z.literal(60)]) }),
      { choices: { '50': '50 Hz', '60': '60 Hz' } },
    )
    expect(unsupported).toEqual([])
    expect(fields).toEqual([
      {
        key: 'hz',
        label: 'Hz',
        optional: false,
        type: 'choice',
        choices: [
          { value: 50, title: '50 Hz' },
          { value: 60, title: '60 Hz' },
        ],
      },
    ])
  })
})

describe('the motor nameplate form', () => {
  it('has a field for every figure on the plate, in words, with the schema’s bounds', () => {
    expect(NAMEPLATE_FIELDS.map((f) => f.key)).toEqual(Object.keys(motorNameplateSchema.shape))
    const volts = NAMEPLATE_FIELDS.find((f) => f.key === 'ratedVolts')
    expect(volts).toMatchObject({ type: 'number', label: 'Rated voltage', min: 100, max: 690 })
    const amps = NAMEPLATE_FIELDS.find((f) => f.key === 'fullLoadAmps')
    expect(amps).toMatchObject({ type: 'number', min: 0, minExclusive: true, max: 1000 })
    expect(NAMEPLATE_FIELDS.find((f) => f.key === 'insulationClass')).toMatchObject({
      type: 'choice',
      optional: true,
    })
    for (const field of NAMEPLATE_FIELDS) expect(field.label, field.key).not.toMatch(/[a-z][A-Z]/)
  })

  it('has words for every value a nameplate choice can take', () => {
    const choices = NAMEPLATE_FIELDS.filter((f) => f.type === 'choice')
    expect(choices.map((f) => f.key)).toEqual([
      'ratedHz',
      'powerUnit',
      'connection',
      'duty',
      'insulationClass',
    ])
    for (const field of choices)
      for (const choice of field.type === 'choice' ? field.choices : [])
        expect(NAMEPLATE_CHOICE_WORDS[String(choice.value)], `${field.key} ${choice.value}`).toBeTruthy()
  })

  it('builds the bench motor’s plate from the starting settings, consistent with itself', () => {
    const standard = benchNameplate({})
    expect(nameplateProblems(standard)).toEqual([])
    const sixty = benchNameplate({
      'motor.ratedFrequency': 60,
      'motor.ratedSpeed': 1750,
      'motor.ratedVoltage': 460,
    })
    expect(sixty).toMatchObject({ ratedHz: 60, ratedRpm: 1750, ratedVolts: 460 })
    expect(nameplateProblems(sixty)).toEqual([])
    // A setting the drive would refuse is not used.
    expect(benchNameplate({ 'motor.ratedVoltage': 'four hundred' }).ratedVolts).toBe(standard.ratedVolts)
  })
})
