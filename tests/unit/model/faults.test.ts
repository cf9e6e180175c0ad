// Injected faults for the grader: whether one is still there, and what the bench reads without it (the
// counterfactual that says whether a measurement tells the fault apart).
import { describe, expect, it } from 'vitest'
import {
  faultPresent,
  readCircuit,
  withFaultCleared,
  type AttemptEvent,
  type InjectedFault,
  type SimState,
} from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

const meter = (s: SimState) => readCircuit(s).meter
function measure(s: SimState, mode: 'dcVolts' | 'resistance', red: string, black: string): SimState {
  const events: AttemptEvent[] = [
    { t: s.t, type: 'meter.mode', mode },
    { t: s.t, type: 'meter.probes', red, black },
  ]
  return run(s, events)
}

describe('a blown control fuse', () => {
  const fuse: InjectedFault = { kind: 'blownFuse' }
  const s = measure(start(raiseLowerSetup({ faults: [fuse] })), 'dcVolts', 'drive.p24', 'drive.0v')

  it('reads 0 V across +24 and 0V with the display lit, and 24 V on a healthy bench', () => {
    expect(faultPresent(s, fuse)).toBe(true)
    expect(meter(s).volts).toBe(0)
    expect(meter(withFaultCleared(s, fuse)).volts!).toBeGreaterThan(23)
  })

  it('leaves the real state alone', () => {
    withFaultCleared(s, fuse)
    expect(s.fuseBlown).toBe(true)
  })
})

describe('a broken wire, de-energised', () => {
  const broken: InjectedFault = { kind: 'brokenWire', wireId: 'r2' }
  const s = measure(
    start(raiseLowerSetup({ power: { on: false, locked: true }, faults: [broken] })),
    'resistance',
    'runSel.b',
    'drive.di1',
  )

  it('reads OL end to end, where a healthy wire reads 0 Ω', () => {
    expect(meter(s).shows).toBe('overRange')
    expect(meter(withFaultCleared(s, broken)).ohms).toBe(0)
  })

  it('reads the same elsewhere: a measurement on another wire does not tell this fault apart', () => {
    const elsewhere = measure(s, 'resistance', 'drive.p24', 'runSel.a')
    expect(meter(withFaultCleared(elsewhere, broken))).toEqual(meter(elsewhere))
  })

  it('is no longer present once the wire is replaced', () => {
    const repaired = run(s, [{ t: s.t, type: 'wire.removed', id: 'r2' }])
    expect(faultPresent(repaired, broken)).toBe(false)
    expect(withFaultCleared(repaired, broken)).toBe(repaired)
  })
})

describe('a contact and a motor conductor', () => {
  it('clears a failed-open contact back to the block as labelled', () => {
    const fault: InjectedFault = { kind: 'contactFailedOpen', device: 'raisePb' }
    const s = run(start(raiseLowerSetup({ faults: [fault] })), [
      { t: 0, type: 'device.pressed', device: 'raisePb' },
    ])
    expect(s.inputs[1]).toBe(false)
    expect(withFaultCleared(s, fault).inputs[1]).toBe(true)
  })

  it('clears a broken motor conductor', () => {
    const fault: InjectedFault = { kind: 'motorConductorOpen', conductor: 'w' }
    const s = start(raiseLowerSetup({ faults: [fault] }))
    expect(withFaultCleared(s, fault).motor.openConductors).toEqual([])
  })
})
