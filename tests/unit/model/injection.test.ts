// Faults put into a bench mid-attempt by an instructor (fault.injected), and the two kinds that live
// outside the circuit: an input that stops responding and a setting changed behind the apprentice's back.
import { describe, expect, it } from 'vitest'
import {
  createSimulation,
  faultPresent,
  readCircuit,
  readDrive,
  withFaultCleared,
  type AttemptEvent,
  type InjectedFault,
  type SimState,
} from '../../../shared/model/index'
import { ModelInputError } from '../../../shared/model/errors'
import { hz, raiseLowerSetup, run, start, wire } from './fixtures'

const by = { id: '00000000-0000-4000-8000-00000000000a', name: 'Ottilie Marsh' }
let next = 0
function inject(t: number, fault: InjectedFault): AttemptEvent {
  next++
  const injectionId = `00000000-0000-4000-8000-${String(next).padStart(12, '0')}`
  return { t, type: 'fault.injected', injectionId, fault, by }
}
const switchRun = (t: number, position: 0 | 1): AttemptEvent => ({
  t,
  type: 'device.switched',
  device: 'runSel',
  position,
})
const terminalVolts = (s: SimState, input: number) => readCircuit(s).inputs[input - 1]!

describe('an input that stops responding', () => {
  const dead: InjectedFault = { kind: 'inputUnresponsive', input: 1 }

  it('reads OFF with its terminal switched ON (24 V across it), so the drive does not run', () => {
    const s = run(start(raiseLowerSetup({ faults: [dead] })), [
      switchRun(1000, 1),
      { t: 6000, type: 'power.on' },
    ])
    expect(terminalVolts(s, 1).volts).toBeGreaterThan(15) // IEC 61131-2 type 1: ON at 15 V and above
    expect(terminalVolts(s, 1).region).toBe('on')
    expect(s.inputs[0]).toBe(false)
    expect(readDrive(s).control).toBe('stopped')
    expect(faultPresent(s, dead)).toBe(true)
    // The same moment with the input working: the drive sees run.
    expect(withFaultCleared(s, dead).inputs[0]).toBe(true)
  })

  it('stops a running drive when injected mid-attempt, and leaves the terminal voltage alone', () => {
    const running = run(start(), [switchRun(1000, 1)])
    expect(running.inputs[0]).toBe(true)
    const s = run(running, [inject(8000, dead)])
    expect(s.inputs[0]).toBe(false)
    expect(s.deadInputs).toEqual([1])
    expect(s.injected).toEqual([dead])
    expect(terminalVolts(s, 1).volts).toBeCloseTo(terminalVolts(running, 1).volts, 6)
    expect(run(s, [{ t: 30_000, type: 'keypad.key', key: 'up' }]).speed.targetHz).toBe(0)
  })

  it('counts as put right once its function is moved to a spare input; the input itself stays dead', () => {
    const s = run(start(), [switchRun(500, 1), inject(1000, dead)])
    const moved = run(s, [
      { t: 2000, type: 'power.off' },
      { t: 3000, type: 'wire.removed', id: 'r2' },
      { t: 4000, type: 'wire.added', id: 'r9', from: 'runSel.b', to: 'drive.di4', colour: 'blue' },
      { t: 6000, type: 'power.on' },
      { t: 10_000, type: 'setting.changed', key: 'di1.function', value: 'none' },
      { t: 10_100, type: 'setting.changed', key: 'di4.function', value: 'run' },
      { t: 10_200, type: 'settings.saved' },
      { t: 20_000, type: 'attempt.ended' },
    ])
    expect(faultPresent(moved, dead)).toBe(false)
    expect(moved.deadInputs).toEqual([1])
    expect(moved.inputs[3]).toBe(true)
    expect(hz(moved)).toBeGreaterThan(0)
  })
})

describe('a setting changed behind the apprentice’s back', () => {
  const slower: InjectedFault = { kind: 'settingChanged', key: 'speed.max', value: 25 }

  it('changes the active value as if saved, keeps the value it replaced, and shows no save message', () => {
    const s = run(start(), [inject(1000, slower)])
    expect(s.settings.active['speed.max']).toBe(25)
    expect(s.settingsBefore).toEqual({ 'speed.max': 50 })
    expect(s.messages).toEqual([])
    expect(faultPresent(s, slower)).toBe(true)
    expect(withFaultCleared(s, slower).settings.active['speed.max']).toBe(50)
    expect(withFaultCleared(s, slower).settingsBefore).toBeUndefined()
  })

  it('keeps the apprentice’s unsaved edits', () => {
    const s = run(start(), [
      { t: 500, type: 'setting.changed', key: 'ramp.accelSeconds', value: 8 },
      inject(1000, slower),
    ])
    expect(s.settings.pending).toEqual({ 'ramp.accelSeconds': 8 })
  })

  it('is put right by saving the value it had before, not by another value', () => {
    const s = run(start(), [inject(1000, slower)])
    const other = run(s, [
      { t: 2000, type: 'setting.changed', key: 'speed.max', value: 40 },
      { t: 2100, type: 'settings.saved' },
    ])
    expect(faultPresent(other, slower)).toBe(true)
    expect(other.settingsBefore).toEqual({ 'speed.max': 50 })
    const back = run(other, [
      { t: 3000, type: 'setting.changed', key: 'speed.max', value: 50 },
      { t: 3100, type: 'settings.saved' },
    ])
    expect(faultPresent(back, slower)).toBe(false)
    expect(back.settingsBefore).toBeUndefined()
  })

  it('changes nothing when the drive would refuse the value (out of range, or a clash)', () => {
    const s = run(start(), [inject(1000, { kind: 'settingChanged', key: 'speed.max', value: 500 })])
    expect(s.settings.active['speed.max']).toBe(50)
    expect(s.settingsBefore).toBeUndefined()
    // Maximum below minimum (5 Hz) clashes with the other settings.
    const clash = run(start(), [inject(1000, { kind: 'settingChanged', key: 'speed.max', value: 2 })])
    expect(clash.settings.active['speed.max']).toBe(50)
  })

  it('starts a scenario with the changed value and refuses one that changes nothing', () => {
    const s = start(raiseLowerSetup({ faults: [slower] }))
    expect(s.settings.active['speed.max']).toBe(25)
    expect(s.settingsBefore).toEqual({ 'speed.max': 50 })
    expect(() =>
      createSimulation(
        raiseLowerSetup({ faults: [{ kind: 'settingChanged', key: 'speed.max', value: 50 }] }),
      ),
    ).toThrow(ModelInputError)
  })
})

describe('the older kinds injected mid-attempt', () => {
  it('gives a device the same state createSimulation gives it', () => {
    for (const kind of ['contactFailedOpen', 'contactWelded', 'wrongContactType'] as const) {
      const fault: InjectedFault = { kind, device: 'raisePb' }
      const fromStart = start(raiseLowerSetup({ faults: [fault] }))
      const injected = run(start(), [inject(0, fault)])
      expect(injected.devices.raisePb).toEqual(fromStart.devices.raisePb)
      expect(faultPresent(injected, fault)).toBe(true)
    }
  })

  it('breaks a wire mid-run: the drive loses its run input', () => {
    const fault: InjectedFault = { kind: 'brokenWire', wireId: 'r2' }
    const s = run(start(), [switchRun(500, 1), inject(5000, fault)])
    expect(s.inputs[0]).toBe(false)
    expect(faultPresent(s, fault)).toBe(true)
  })

  it('blows the control fuse mid-run (the drive loses +24 V and its inputs) until the fuse is replaced', () => {
    const fault: InjectedFault = { kind: 'blownFuse' }
    const s = run(start(), [switchRun(500, 1), inject(5000, fault)])
    expect(s.fuseBlown).toBe(true)
    expect(s.inputs[0]).toBe(false)
    expect(faultPresent(s, fault)).toBe(true)
    const repaired = run(s, [
      { t: 6000, type: 'power.off' },
      { t: 7000, type: 'fuse.replaced' },
    ])
    expect(faultPresent(repaired, fault)).toBe(false)
  })

  it('breaks a motor-cable conductor mid-attempt until the cable is replaced', () => {
    const fault: InjectedFault = { kind: 'motorConductorOpen', conductor: 'v' }
    const s = run(start(), [inject(1000, fault)])
    expect(s.motor.openConductors).toEqual(['v'])
    expect(withFaultCleared(s, fault).motor.openConductors).toEqual([])
    const repaired = run(s, [
      { t: 2000, type: 'power.off' },
      { t: 3000, type: 'motor.cableReplaced' },
    ])
    expect(faultPresent(repaired, fault)).toBe(false)
  })

  it('changes nothing for a target the bench does not have, but records the injection', () => {
    const before = run(start(), [switchRun(500, 1)])
    const s = run(before, [inject(1000, { kind: 'brokenWire', wireId: 'gone' })])
    expect(s.brokenWires).toEqual([])
    expect(s.injected).toHaveLength(1)
    expect(s.inputs).toEqual(before.inputs)
  })

  it('leaves a bench without injections with none of the new fields', () => {
    const s = run(
      start(raiseLowerSetup({ wires: [...raiseLowerSetup().wires, wire('x', 'drive.p24', 'drive.di4')] })),
      [switchRun(500, 1)],
    )
    expect('deadInputs' in s || 'settingsBefore' in s || 'injected' in s).toBe(false)
  })
})
