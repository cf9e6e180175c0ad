// The motor cable from the drive's U, V, W to the motor's U1, V1, W1: an open phase trips the drive,
// a swapped pair turns the motor the other way, and both are put right by terminal work.
import { describe, expect, it } from 'vitest'
import {
  advance,
  readCircuit,
  readDrive,
  readFrontPanel,
  type AttemptEvent,
  type MeterReading,
  type SimState,
  type SimulationSetup,
} from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

/** The meter on resistance across two points. */
function ohmmeter(setup: SimulationSetup, red: string, black: string): MeterReading {
  const s = run(start(setup), [
    { t: 0, type: 'meter.mode', mode: 'resistance' },
    { t: 0, type: 'meter.probes', red, black },
  ])
  return readCircuit(s).meter
}

/** Switch the run selector on and let the drive reach its 5 Hz minimum. */
function started(setup: SimulationSetup): SimState {
  return advance(run(start(setup), [{ t: 0, type: 'device.switched', device: 'runSel', position: 1 }]), 5000)
}

describe('an open motor phase', () => {
  it('trips the drive as it starts: our own fault words and short code, output off', () => {
    const s = started(raiseLowerSetup({ faults: [{ kind: 'motorConductorOpen', conductor: 'v' }] }))
    const drive = readDrive(s)
    expect(drive.tripped).toBe(true)
    expect(drive.faults.map((f) => [f.code, f.short])).toEqual([['motorPhaseLost', 'T-MPH']])
    expect(drive.faults[0].text).toMatch(/Motor phase lost/)
    expect(drive.outputOn).toBe(false)
    expect(drive.outputHz).toBe(0)
  })

  it('trips the same way when a conductor is not landed', () => {
    const s = started(raiseLowerSetup({ motorCable: { u: 'u1', v: 'v1', w: null } }))
    expect(readDrive(s).faults.map((f) => f.code)).toEqual(['motorPhaseLost'])
  })

  it('trips a running drive the moment a conductor is lifted (and the work was done live)', () => {
    const s = run(started(raiseLowerSetup()), [
      { t: 6000, type: 'motor.conductorLanded', conductor: 'u', terminal: null },
    ])
    expect(readDrive(s).tripped).toBe(true)
    expect(readDrive(s).control).toBe('coasting')
  })

  it('trips again after a reset while the phase is still open, and runs once the cable is replaced', () => {
    let s = started(raiseLowerSetup({ faults: [{ kind: 'motorConductorOpen', conductor: 'w' }] }))
    const cycle: AttemptEvent[] = [
      { t: 6000, type: 'device.switched', device: 'runSel', position: 0 },
      { t: 6100, type: 'keypad.key', key: 'reset' },
      { t: 6200, type: 'device.switched', device: 'runSel', position: 1 },
    ]
    s = run(s, cycle)
    expect(readDrive(s).faults.map((f) => f.code)).toEqual(['motorPhaseLost'])
    s = run(s, [{ t: 7000, type: 'motor.cableReplaced' }])
    expect(s.motor.openConductors).toEqual([])
    s = run(s, [
      { t: 7100, type: 'device.switched', device: 'runSel', position: 0 },
      { t: 7200, type: 'keypad.key', key: 'reset' },
      { t: 7300, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    s = advance(s, 5000)
    expect(readDrive(s).tripped).toBe(false)
    expect(readDrive(s).outputHz).toBeCloseTo(5, 6)
  })

  it('reads over-range on two of the three phase pairs at the drive output, de-energised', () => {
    const setup = raiseLowerSetup({
      power: { on: false, locked: true },
      faults: [{ kind: 'motorConductorOpen', conductor: 'v' }],
    })
    const shows = (red: string, black: string) => ohmmeter(setup, red, black).shows
    expect([shows('drive.u', 'drive.v'), shows('drive.v', 'drive.w'), shows('drive.u', 'drive.w')]).toEqual([
      'overRange',
      'overRange',
      'ohms',
    ])
    // …and the broken conductor itself, end to end.
    expect(shows('drive.v', 'motor.v1')).toBe('overRange')
    expect(shows('drive.u', 'motor.u1')).toBe('ohms')
  })
})

describe('a swapped pair of conductors', () => {
  const swapped = raiseLowerSetup({ motorCable: { u: 'v1', v: 'u1', w: 'w1' } })

  it('turns the motor the other way while the drive believes it runs forward', () => {
    const drive = readDrive(started(swapped))
    expect(drive.tripped).toBe(false)
    expect(drive.speedRpm).toBeGreaterThan(0)
    expect(drive.motorRpm).toBeCloseTo(-drive.speedRpm, 9)
  })

  it('is put right by swapping two conductors back at the motor terminals', () => {
    const fixed = run(start({ ...swapped, power: { on: false, locked: true } }), [
      { t: 0, type: 'motor.conductorLanded', conductor: 'u', terminal: null },
      { t: 10, type: 'motor.conductorLanded', conductor: 'v', terminal: 'v1' },
      { t: 20, type: 'motor.conductorLanded', conductor: 'u', terminal: 'u1' },
    ])
    expect(fixed.motor.cable).toEqual({ u: 'u1', v: 'v1', w: 'w1' })
  })

  it('turns forward with all three conductors rotated one place (an even permutation keeps the order)', () => {
    const rotated = raiseLowerSetup({ motorCable: { u: 'v1', v: 'w1', w: 'u1' } })
    expect(readDrive(started(rotated)).motorRpm).toBeGreaterThan(0)
  })
})

describe('landing a conductor', () => {
  it('is refused on a terminal that already has one, with a message', () => {
    const s = run(start(), [{ t: 0, type: 'motor.conductorLanded', conductor: 'u', terminal: 'v1' }])
    expect(s.motor.cable).toEqual({ u: 'u1', v: 'v1', w: 'w1' })
    expect(s.messages[0].code).toBe('terminalOccupied')
    expect(s.messages[0].text).toMatch(/V1 already has the V conductor/)
  })

  it('shows the trip on the lit display with its short code', () => {
    const s = started(raiseLowerSetup({ faults: [{ kind: 'motorConductorOpen', conductor: 'u' }] }))
    const panel = readFrontPanel(s)
    expect(panel.status!.state).toBe('tripped')
    expect(panel.status!.faults[0].short).toBe('T-MPH')
  })
})
