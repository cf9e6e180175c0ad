// Turns an objective's zod schema (or another part's, such as the motor nameplate) into field
// descriptions the form renders, so a new objective kind gets its form from its schema. Fields that need a picker (a setting, the scenario's devices, faults,
// hints …) are marked by name in PICKERS; the form draws those with their own components.
import { z } from 'zod'
import { objectiveSchema, type ObjectiveKind } from '@shared/scenario/objectiveSchema'

export type Picker =
  | 'setting' // a setting from the catalogue
  | 'settingValue' // a value of the chosen setting (its unit, range or options)
  | 'device' // one of the scenario's devices
  | 'fault' // one of the scenario's faults
  | 'hints' // some of the scenario's hints
  | 'inputSelector' // an input function or a drive terminal
  | 'deviceCondition' // which devices are held, released or set where
  | 'wiringExpect' // ON, OFF or a voltage window
  | 'diagnosisExpect' // a part and what is wrong with it
  | 'probePairs' // pairs of terminals to prove dead

export interface Choice {
  value: string | number | boolean
  title: string
}

interface FieldBase {
  key: string
  label: string
  optional: boolean
  help?: string
}
export type FieldDescription =
  | (FieldBase & { type: 'text'; minLength?: number })
  | (FieldBase & {
      type: 'number'
      min?: number
      max?: number
      /** The bound itself is not allowed (a "positive" number). */
      minExclusive?: boolean
      integer: boolean
    })
  | (FieldBase & { type: 'boolean' })
  | (FieldBase & { type: 'choice'; choices: Choice[] })
  | (FieldBase & { type: 'picker'; picker: Picker })

/** Fields every objective has that the form sets itself (never shown). */
const HIDDEN = new Set(['id', 'kind'])

/** Fields drawn by a picker, by name; `kind.name` wins over `name`. */
const PICKERS: Record<string, Picker> = {
  key: 'setting',
  'settingEquals.value': 'settingValue',
  'settingInRange.min': 'settingValue',
  'settingInRange.max': 'settingValue',
  device: 'device',
  fault: 'fault',
  hints: 'hints',
  input: 'inputSelector',
  while: 'deviceCondition',
  'wiringCondition.expect': 'wiringExpect',
  'diagnosisCorrect.expect': 'diagnosisExpect',
  pairs: 'probePairs',
}

/** Field names in words, as the form labels them. */
const LABELS: Record<string, string> = {
  title: 'Title the apprentice sees',
  weight: 'Points',
  required: 'Must be met to pass, whatever the score',
  hints: 'Hints offered beside it',
  key: 'Setting',
  value: 'Value',
  min: 'At least',
  max: 'At most',
  while: 'While the devices are',
  input: 'Input',
  expect: 'Expected',
  device: 'Device held',
  effect: 'Holding it',
  thenHolds: 'Once released, the speed must stay put',
  holdSeconds: 'For how long (seconds)',
  target: 'Target speed',
  unit: 'Unit',
  tolerance: 'Within ±',
  mode: 'Stopped by',
  fromAtLeastHz: 'Only stops from at least (Hz)',
  acrossPowerLoss: 'With the power switched off between the stop and the restart',
  minReferenceHz: 'Remembered speed at least (Hz)',
  toleranceHz: 'Within ± (Hz)',
  thresholdVolts: 'Counts as dead below (V)',
  pairs: 'Terminal pairs to prove dead',
  proveMeterBefore: 'Meter proved on a known live source before the test',
  proveMeterAfter: 'Meter proved on a known live source after the test',
  fault: 'Fault',
  costEach: 'Points taken off for each needless replacement',
  minutes: 'Minutes',
}

/** Enum values in words (every enum of the objective schemas; the unit test checks none is missing). */
export const CHOICE_WORDS: Record<string, string> = {
  raises: 'Raises the speed',
  lowers: 'Lowers the speed',
  rpm: 'rev/min',
  Hz: 'Hz',
  ramp: 'Ramping down',
  coast: 'Coasting',
  on: 'ON',
  off: 'OFF',
}

/** Words for one schema's fields and choices, where the objective words above do not fit. */
export interface FieldWords {
  labels?: Record<string, string>
  choices?: Record<string, string>
}

function fieldLabel(key: string, words: FieldWords): string {
  return (
    words.labels?.[key] ??
    LABELS[key] ??
    key.replace(/([a-z])([A-Z])/g, '$1 $2').replace(/^./, (c) => c.toUpperCase())
  )
}

function numberBounds(schema: z.ZodNumber) {
  const checks = (schema.def.checks ?? []) as { _zod: { def: { check: string; inclusive?: boolean } } }[]
  const exclusiveMin = checks.some(
    (c) => c._zod.def.check === 'greater_than' && c._zod.def.inclusive === false,
  )
  const min = Number.isFinite(schema.minValue) ? (schema.minValue as number) : undefined
  const max = Number.isFinite(schema.maxValue) ? (schema.maxValue as number) : undefined
  return { min, max, minExclusive: exclusiveMin, integer: schema.isInt }
}

/** The values of a union made only of literals (`z.union([z.literal(50), z.literal(60)])`), else null. */
function literalUnionValues(schema: z.ZodType): (string | number | boolean)[] | null {
  if (!(schema instanceof z.ZodUnion)) return null
  const options = schema.options as z.ZodType[]
  if (!options.every((o) => o instanceof z.ZodLiteral)) return null
  return options.flatMap((o) => [...(o as z.ZodLiteral).values] as (string | number | boolean)[])
}

function describe(kind: string, key: string, raw: z.ZodType, words: FieldWords): FieldDescription | null {
  const optional = raw instanceof z.ZodOptional
  const schema = (optional ? (raw as z.ZodOptional<z.ZodType>).unwrap() : raw) as z.ZodType
  const base = { key, label: fieldLabel(key, words), optional }
  const choice = (v: string | number | boolean): Choice => ({
    value: v,
    title: words.choices?.[String(v)] ?? CHOICE_WORDS[String(v)] ?? String(v),
  })
  const picker = PICKERS[`${kind}.${key}`] ?? PICKERS[key]
  if (picker) return { ...base, type: 'picker', picker }
  if (schema instanceof z.ZodString)
    return { ...base, type: 'text', minLength: schema.minLength ?? undefined }
  if (schema instanceof z.ZodNumber) return { ...base, type: 'number', ...numberBounds(schema) }
  if (schema instanceof z.ZodBoolean) return { ...base, type: 'boolean' }
  if (schema instanceof z.ZodEnum) {
    const values = schema.options as (string | number)[]
    return { ...base, type: 'choice', choices: values.map(choice) }
  }
  if (schema instanceof z.ZodLiteral) {
    const values = [...schema.values] as (string | number | boolean)[]
    return { ...base, type: 'choice', choices: values.map(choice) }
  }
  const literals = literalUnionValues(schema)
  if (literals) return { ...base, type: 'choice', choices: literals.map(choice) }
  // A shape the form has no field for: the caller lists it as not yet in the form.
  return null
}

/** The fields of one object schema, in its order; `unsupported` names the fields it could not describe. */
export function schemaFields(
  kind: string,
  schema: z.ZodObject,
  words: FieldWords = {},
): { fields: FieldDescription[]; unsupported: string[] } {
  const fields: FieldDescription[] = []
  const unsupported: string[] = []
  for (const [key, field] of Object.entries(schema.shape)) {
    if (HIDDEN.has(key)) continue
    const described = describe(kind, key, field as z.ZodType, words)
    if (described) fields.push(described)
    else unsupported.push(key)
  }
  return { fields, unsupported }
}

/** The object schema of each objective kind, read from the discriminated union. */
export function objectiveKindSchema(kind: ObjectiveKind): z.ZodObject {
  const option = objectiveSchema.options.find((o) => o.shape.kind.value === kind)
  if (!option) throw new Error(`No objective schema for ${kind}`)
  return option as unknown as z.ZodObject
}

/** The fields of an objective kind (cached: the schemas never change at run time). */
const cache = new Map<ObjectiveKind, FieldDescription[]>()
export function objectiveFields(kind: ObjectiveKind): FieldDescription[] {
  let fields = cache.get(kind)
  if (!fields) {
    fields = schemaFields(kind, objectiveKindSchema(kind)).fields
    cache.set(kind, fields)
  }
  return fields
}

/** A new objective of a kind: required booleans off, required choices at their first value, numbers empty. */
export function newObjective(kind: ObjectiveKind, id: string, title: string): Record<string, unknown> {
  const objective: Record<string, unknown> = { id, kind, title, weight: 10 }
  for (const field of objectiveFields(kind)) {
    if (field.optional || field.key in objective) continue
    if (field.type === 'boolean') objective[field.key] = false
    else if (field.type === 'choice') objective[field.key] = field.choices[0]?.value
    else if (field.type === 'picker' && field.picker === 'deviceCondition') objective[field.key] = {}
    else if (field.type === 'picker' && field.picker === 'inputSelector')
      objective[field.key] = { function: '' }
    else if (field.type === 'picker' && field.picker === 'wiringExpect') objective[field.key] = 'on'
  }
  return objective
}
