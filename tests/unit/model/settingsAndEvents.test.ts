// The settings catalogue, the event schema and how refused actions are reported.
import { describe, expect, it } from 'vitest'
import {
  attemptEventSchema,
  attemptLogSchema,
  createSimulation,
  DEFAULT_SETTINGS,
  readCircuit,
  readDrive,
  SETTING_GROUPS,
  SETTINGS,
  simulationSetupSchema,
  validateSetting,
} from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

describe('settings catalogue', () => {
  it('gives every setting a label, a known group, help text and a default that passes its own check', () => {
    const groups = new Set(SETTING_GROUPS.map((g) => g.id))
    for (const def of SETTINGS) {
      expect(def.label.length).toBeGreaterThan(3)
      expect(def.help.length).toBeGreaterThan(10)
      expect(groups.has(def.group)).toBe(true)
      expect(validateSetting(def.key, def.default)).toEqual({ ok: true, value: def.default })
    }
  })

  it('uses our own keys, never numeric parameter codes', () => {
    for (const def of SETTINGS) expect(def.key).toMatch(/^[a-z][a-zA-Z0-9]*\.[a-z][a-zA-Z0-9]*$/)
  })

  it('explains a value out of range with the allowed range and unit', () => {
    expect(validateSetting('speed.max', 500)).toEqual({
      ok: false,
      message: 'Maximum speed must be between 1 Hz and 120 Hz.',
    })
  })

  it('explains a choice that does not exist', () => {
    const check = validateSetting('inputs.logic', 'npn')
    expect(check.ok).toBe(false)
    expect(!check.ok && check.message).toMatch(/Input logic must be one of/)
  })

  it('refuses an unknown key and a value of the wrong type', () => {
    expect(validateSetting('p1.23', 4).ok).toBe(false)
    expect(validateSetting('ramp.accelSeconds', '5')).toEqual({
      ok: false,
      message: 'Acceleration time must be a number.',
    })
  })

  it('defaults the remote reference to analog, so raise/lower must be selected on purpose', () => {
    expect(DEFAULT_SETTINGS['reference.remoteSource']).toBe('analog')
  })
})

describe('editing and saving settings', () => {
  it('keeps an edit pending until it is saved', () => {
    const edited = run(start(), [{ t: 0, type: 'setting.changed', key: 'raiseLower.rate', value: 4 }])
    expect(edited.settings.active['raiseLower.rate']).toBe(2)
    const saved = run(edited, [{ t: 10, type: 'settings.saved' }])
    expect(saved.settings.active['raiseLower.rate']).toBe(4)
    expect(saved.settings.pending).toEqual({})
  })

  it('refuses an out-of-range value at save, reports it and keeps the edit for correction', () => {
    const s = run(start(), [
      { t: 0, type: 'setting.changed', key: 'speed.max', value: 500 },
      { t: 0, type: 'setting.changed', key: 'raiseLower.rate', value: 3 },
      { t: 10, type: 'settings.saved' },
    ])
    expect(s.settings.active['speed.max']).toBe(50)
    expect(s.settings.active['raiseLower.rate']).toBe(3)
    expect(s.settings.pending).toEqual({ 'speed.max': 500 })
    expect(readDrive(s).messages.map((m) => [m.code, m.key])).toEqual([
      ['settingRefused', 'speed.max'],
      ['settingsSaved', undefined],
    ])
  })

  it('refuses a minimum speed above the maximum', () => {
    const s = run(start(), [
      { t: 0, type: 'setting.changed', key: 'speed.min', value: 60 },
      { t: 10, type: 'settings.saved' },
    ])
    expect(s.settings.active['speed.min']).toBe(5)
    expect(readDrive(s).messages[0].text).toMatch(/below maximum speed/)
  })

  it('refuses to change input functions while the motor turns', () => {
    const s = run(start(), [
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
      { t: 10, type: 'setting.changed', key: 'di4.function', value: 'preset' },
      { t: 20, type: 'settings.saved' },
    ])
    expect(s.settings.active['di4.function']).toBe('none')
    expect(readDrive(s).messages[0].text).toMatch(/Stop the drive/)
  })

  it('cannot save with the keypad dark', () => {
    const s = run(start(raiseLowerSetup({ power: { on: false, locked: false } })), [
      { t: 0, type: 'setting.changed', key: 'raiseLower.rate', value: 4 },
      { t: 10, type: 'settings.saved' },
    ])
    expect(s.settings.active['raiseLower.rate']).toBe(2)
    expect(s.settings.pending).toEqual({ 'raiseLower.rate': 4 })
    expect(readDrive(s).messages[0].code).toBe('saveNeedsPower')
  })
})

describe('attempt event schema', () => {
  it('accepts every documented event type', () => {
    const events = [
      { t: 0, type: 'wire.added', id: 'w1', from: 'drive.p24', to: 'runSel.a', colour: 'blue' },
      { t: 1, type: 'wire.removed', id: 'w1' },
      { t: 2, type: 'device.pressed', device: 'raisePb' },
      { t: 3, type: 'device.released', device: 'raisePb' },
      { t: 4, type: 'device.switched', device: 'runSel', position: 1 },
      { t: 5, type: 'device.turned', device: 'pot', position: 0.25 },
      { t: 6, type: 'device.contactFitted', device: 'raisePb', contact: 'NC' },
      { t: 7, type: 'fuse.replaced' },
      { t: 8, type: 'setting.changed', key: 'speed.max', value: 60 },
      { t: 9, type: 'settings.saved' },
      { t: 10, type: 'power.on' },
      { t: 11, type: 'power.off' },
      { t: 12, type: 'lock.applied' },
      { t: 13, type: 'lock.removed' },
      { t: 14, type: 'meter.probes', red: 'drive.l1', black: null },
      { t: 15, type: 'keypad.key', key: 'enter' },
      { t: 16, type: 'hint.revealed', hintId: 'h1' },
      { t: 17, type: 'attempt.ended' },
    ]
    expect(attemptLogSchema.safeParse(events).success).toBe(true)
  })

  it('rejects a fractional time, an unknown setting key and an unknown type', () => {
    expect(attemptEventSchema.safeParse({ t: 1.5, type: 'power.on' }).success).toBe(false)
    expect(
      attemptEventSchema.safeParse({ t: 1, type: 'setting.changed', key: 'x.y', value: 1 }).success,
    ).toBe(false)
    expect(attemptEventSchema.safeParse({ t: 1, type: 'drive.exploded' }).success).toBe(false)
  })

  it('rejects a log whose times go back, naming the event', () => {
    const result = attemptLogSchema.safeParse([
      { t: 10, type: 'power.on' },
      { t: 5, type: 'power.off' },
    ])
    expect(result.success).toBe(false)
    expect(result.error!.issues[0].path).toEqual([1, 't'])
  })
})

describe('refused actions lose nothing and say why', () => {
  it.each([
    [
      { t: 0, type: 'wire.added', id: 'x', from: 'drive.l1', to: 'drive.di1', colour: 'blue' } as const,
      'wireRefused',
    ],
    [
      { t: 0, type: 'wire.added', id: 'x', from: 'nowhere.a', to: 'drive.di1', colour: 'blue' } as const,
      'unknownPoint',
    ],
    [
      { t: 0, type: 'wire.added', id: 'c', from: 'drive.p24', to: 'drive.di1', colour: 'blue' } as const,
      'wireRefused',
    ],
    [{ t: 0, type: 'wire.removed', id: 'nope' } as const, 'unknownWire'],
    [{ t: 0, type: 'device.pressed', device: 'ghost' } as const, 'unknownDevice'],
    [{ t: 0, type: 'device.pressed', device: 'runSel' } as const, 'wrongDeviceKind'],
    [{ t: 0, type: 'meter.probes', red: 'drive.zz', black: null } as const, 'unknownPoint'],
  ])('refuses %o with %s', (event, code) => {
    const before = start()
    const after = run(before, [event])
    expect(readDrive(after).messages[0].code).toBe(code)
    expect(after.wires).toBe(before.wires)
    expect(after.devices).toBe(before.devices)
  })

  it('rejects a bad setup with a clear error', () => {
    const setup = raiseLowerSetup({ faults: [{ kind: 'brokenWire', wireId: 'missing' }] })
    expect(() => createSimulation(setup)).toThrow(/broken-wire fault names no wire "missing"/)
    expect(simulationSetupSchema.safeParse({ devices: 'no' }).success).toBe(false)
  })
})

describe('injected faults', () => {
  it('a broken wire looks fitted but conducts nothing', () => {
    const s = run(start(raiseLowerSetup({ faults: [{ kind: 'brokenWire', wireId: 'u2' }] })), [
      { t: 0, type: 'device.pressed', device: 'raisePb' },
    ])
    expect(s.wires.some((w) => w.id === 'u2')).toBe(true)
    expect(readCircuit(s).inputs[1].on).toBe(false)
  })

  it('a contact that failed open never closes; fitting a new block cures it', () => {
    const failed = start(raiseLowerSetup({ faults: [{ kind: 'contactFailedOpen', device: 'raisePb' }] }))
    expect(readCircuit(run(failed, [{ t: 0, type: 'device.pressed', device: 'raisePb' }])).inputs[1].on).toBe(
      false,
    )
    const fixed = run(failed, [
      { t: 0, type: 'device.contactFitted', device: 'raisePb', contact: 'NO' },
      { t: 10, type: 'device.pressed', device: 'raisePb' },
    ])
    expect(readCircuit(fixed).inputs[1].on).toBe(true)
  })

  it('a welded contact never opens', () => {
    const s = start(raiseLowerSetup({ faults: [{ kind: 'contactWelded', device: 'lowerPb' }] }))
    expect(readCircuit(s).inputs[2].on).toBe(true)
  })

  it('a wrong contact type behaves as the other type (an "NO" button that is really NC)', () => {
    const s = start(raiseLowerSetup({ faults: [{ kind: 'wrongContactType', device: 'raisePb' }] }))
    expect(readCircuit(s).inputs[1].on).toBe(true)
    expect(readCircuit(run(s, [{ t: 0, type: 'device.pressed', device: 'raisePb' }])).inputs[1].on).toBe(
      false,
    )
  })
})
