// Faults that stop the drive and alarms that do not, through the whole simulation (circuit → drive).
import { describe, expect, it } from 'vitest'
import { advance, readDrive, type SimState, type SimulationSetup } from '../../../shared/model/index'
import { control, hz, raiseLowerSetup, run, start, wire } from './fixtures'

const codes = (s: SimState) => readDrive(s).alarms.map((a) => a.code)
const faults = (s: SimState) => readDrive(s).faults.map((f) => f.code)
const withSettings = (settings: SimulationSetup['settings']) => {
  const base = raiseLowerSetup()
  return start({ ...base, settings: { ...base.settings, ...settings } })
}

describe('configuration alarms (the drive keeps running)', () => {
  it('warns when raise/lower inputs are assigned but the remote reference is left at its default', () => {
    const s = withSettings({ 'reference.remoteSource': 'analog' })
    expect(codes(s)).toContain('raiseLowerNotSelected')
    expect(readDrive(s).tripped).toBe(false)
  })

  it('warns about raise without lower', () => {
    expect(codes(withSettings({ 'di3.function': 'none' }))).toContain('raiseWithoutLower')
  })

  it('warns about lower without raise', () => {
    expect(codes(withSettings({ 'di2.function': 'none' }))).toContain('lowerWithoutRaise')
  })

  it('warns when one function is on two inputs', () => {
    const s = withSettings({ 'di4.function': 'run' })
    expect(codes(s)).toContain('duplicateFunction')
    expect(readDrive(s).alarms.find((a) => a.code === 'duplicateFunction')!.text).toMatch(/DI1 and DI4/)
  })

  it('warns when run commands come from the terminals but no run input is assigned', () => {
    expect(codes(withSettings({ 'di1.function': 'none' }))).toContain('noRunInput')
  })

  it('warns about a start input without a stop input', () => {
    expect(codes(withSettings({ 'di1.function': 'start' }))).toContain('startWithoutStop')
  })

  it('shows no alarm for the correctly programmed raise/lower scheme', () => {
    expect(codes(start())).toEqual([])
  })

  it('keeps running with an alarm present', () => {
    const s = run(withSettings({ 'di4.function': 'raise' }), [
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    expect(control(advance(s, 2000))).toBe('atSpeed')
    expect(readDrive(s).alarms.length).toBeGreaterThan(0)
  })
})

describe('faults (the drive stops by coasting)', () => {
  const runningWithExternalFault = () => {
    const base = raiseLowerSetup()
    const setup: SimulationSetup = {
      ...base,
      devices: [...base.devices, { id: 'guard', kind: 'pushbutton', label: 'Guard switch', contact: 'NC' }],
      wires: [...base.wires, wire('g1', 'drive.p24', 'guard.a'), wire('g2', 'guard.b', 'drive.di4')],
      settings: { ...base.settings, 'di4.function': 'externalFault', 'di5.function': 'faultReset' },
    }
    return advance(
      run(start(setup), [{ t: 0, type: 'device.switched', device: 'runSel', position: 1 }]),
      1000,
    )
  }

  it('trips on an external fault (its NC circuit opening) and coasts', () => {
    const s = run(runningWithExternalFault(), [{ t: 1000, type: 'device.pressed', device: 'guard' }])
    expect(faults(s)).toEqual(['externalFault'])
    expect(control(s)).toBe('coasting')
    expect(readDrive(s).outputOn).toBe(false)
  })

  it('refuses a reset while the external fault input is still OFF', () => {
    const s = run(runningWithExternalFault(), [
      { t: 1000, type: 'device.pressed', device: 'guard' },
      { t: 2000, type: 'keypad.key', key: 'reset' },
    ])
    expect(readDrive(s).tripped).toBe(true)
    expect(readDrive(s).messages.map((m) => m.code)).toEqual(['resetRefused'])
  })

  it('resets once the cause is gone, but a maintained run must be cycled before it restarts', () => {
    const s = run(runningWithExternalFault(), [
      { t: 1000, type: 'device.pressed', device: 'guard' },
      { t: 2000, type: 'device.released', device: 'guard' },
      { t: 3000, type: 'keypad.key', key: 'reset' },
    ])
    expect(readDrive(s).tripped).toBe(false)
    expect(readDrive(advance(s, 30_000)).control).toBe('stopped')
    expect(readDrive(advance(s, 30_000)).restartInterlock).toBe(true)
    const cycled = run(s, [
      { t: 40_000, type: 'device.switched', device: 'runSel', position: 0 },
      { t: 41_000, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    expect(control(cycled)).toBe('accelerating')
  })

  it('trips with "power lost" when the supply is switched off while running', () => {
    const s = run(runningWithExternalFault(), [{ t: 1000, type: 'power.off' }])
    expect(faults(s)).toEqual(['powerLost'])
    expect(control(s)).toBe('coasting')
  })

  it('trips on bus overvoltage when the decel ramp is shorter than the load tolerates', () => {
    const heavy = raiseLowerSetup({ machine: { minDecelSeconds: 10, coastSeconds: 20 } })
    const s = run(
      advance(run(start(heavy), [{ t: 0, type: 'device.switched', device: 'runSel', position: 1 }]), 1000),
      [{ t: 1000, type: 'device.switched', device: 'runSel', position: 0 }],
    )
    expect(faults(s)).toEqual(['busOvervoltage'])
    expect(control(s)).toBe('coasting')
    expect(hz(advance(s, 20_000))).toBeCloseTo(5 * Math.exp(-1), 9)
  })

  it('stops by ramp without a trip when the decel ramp is long enough for the load', () => {
    const heavy = raiseLowerSetup({ machine: { minDecelSeconds: 4 } })
    const s = run(
      advance(run(start(heavy), [{ t: 0, type: 'device.switched', device: 'runSel', position: 1 }]), 1000),
      [{ t: 1000, type: 'device.switched', device: 'runSel', position: 0 }],
    )
    expect(faults(s)).toEqual([])
    expect(control(s)).toBe('rampStopping')
  })
})
