// Raise/lower (electronic potentiometer) reference: ramp while held, clamps, both held, memories.
// Behaviour per REFERENCES.md: OSCAT BASIC TUNE2-style ramp-while-held with limits (common practice);
// memory at power loss follows IEC 61131-3 RETAIN semantics (kept through a warm restart).
import { describe, expect, it } from 'vitest'
import { advance, readDrive, type SimState, type SimulationSetup } from '../../../shared/model/index'
import { hz, raiseLowerSetup, run, start } from './fixtures'

const ref = (s: SimState) => readDrive(s).referenceHz

/** Running at minimum speed (5 Hz) from t = 0, with the given extra settings. */
function runningAtMinimum(settings: SimulationSetup['settings'] = {}): SimState {
  const base = raiseLowerSetup()
  const s = run(start({ ...base, settings: { ...base.settings, ...settings } }), [
    { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
  ])
  return advance(s, 1000) // 5 Hz at 10 Hz/s is reached in 0.5 s
}

describe('raise and lower while the drive runs', () => {
  it('starts at max(minimum speed, reference)', () => {
    expect(hz(runningAtMinimum())).toBe(5)
  })

  it('raises the reference at the set rate while raise is held', () => {
    const s = run(runningAtMinimum(), [{ t: 1000, type: 'device.pressed', device: 'raisePb' }])
    expect(ref(advance(s, 3000))).toBeCloseTo(5 + 2 * 3, 9) // 2 Hz/s for 3 s
    expect(hz(advance(s, 3000))).toBeCloseTo(11, 9) // the output tracks it (2 Hz/s < 10 Hz/s ramp)
  })

  it('keeps the reference when raise is released', () => {
    const s = run(runningAtMinimum(), [
      { t: 1000, type: 'device.pressed', device: 'raisePb' },
      { t: 3500, type: 'device.released', device: 'raisePb' },
    ])
    expect(ref(advance(s, 10_000))).toBeCloseTo(10, 9)
    expect(readDrive(advance(s, 10_000)).control).toBe('atSpeed')
  })

  it('lowers the reference while lower is held', () => {
    const s = run(runningAtMinimum(), [
      { t: 1000, type: 'device.pressed', device: 'raisePb' },
      { t: 6000, type: 'device.released', device: 'raisePb' },
      { t: 7000, type: 'device.pressed', device: 'lowerPb' },
    ])
    expect(ref(advance(s, 2000))).toBeCloseTo(15 - 4, 9)
    expect(readDrive(s).control).toBe('decelerating')
  })

  it('keeps the reference when raise and lower are held together', () => {
    const s = run(runningAtMinimum(), [
      { t: 1000, type: 'device.pressed', device: 'raisePb' },
      { t: 2000, type: 'device.pressed', device: 'lowerPb' },
    ])
    expect(ref(advance(s, 5000))).toBeCloseTo(7, 9)
  })

  it('lets the first button pressed win when set to "first pressed wins"', () => {
    const s = run(runningAtMinimum({ 'raiseLower.bothHeld': 'firstWins' }), [
      { t: 1000, type: 'device.pressed', device: 'raisePb' },
      { t: 2000, type: 'device.pressed', device: 'lowerPb' },
    ])
    expect(ref(advance(s, 1000))).toBeCloseTo(9, 9)
  })

  it('clamps the reference at maximum speed', () => {
    const s = run(runningAtMinimum(), [{ t: 1000, type: 'device.pressed', device: 'raisePb' }])
    expect(ref(advance(s, 60_000))).toBe(50)
    expect(readDrive(advance(s, 60_000)).control).toBe('atSpeed')
  })

  it('clamps the reference at minimum speed', () => {
    const s = run(runningAtMinimum(), [{ t: 1000, type: 'device.pressed', device: 'lowerPb' }])
    expect(ref(advance(s, 10_000))).toBe(5)
  })

  it('does nothing while the drive is stopped', () => {
    const s = run(start(), [{ t: 0, type: 'device.pressed', device: 'raisePb' }])
    expect(ref(advance(s, 5000))).toBe(5)
  })
})

describe('memory of the raise/lower reference', () => {
  const raisedThenStopped = (settings: SimulationSetup['settings']) =>
    advance(
      run(runningAtMinimum(settings), [
        { t: 1000, type: 'device.pressed', device: 'raisePb' },
        { t: 6000, type: 'device.released', device: 'raisePb' },
        { t: 7000, type: 'device.switched', device: 'runSel', position: 0 },
      ]),
      10_000,
    )

  it('keeps the reference through a stop when set to keep', () => {
    const stopped = raisedThenStopped({ 'raiseLower.memoryAtStop': 'keep' })
    expect(readDrive(stopped).control).toBe('stopped')
    const restarted = run(stopped, [{ t: 17_000, type: 'device.switched', device: 'runSel', position: 1 }])
    expect(hz(advance(restarted, 5000))).toBeCloseTo(15, 9)
  })

  it('returns to minimum speed after a stop when set to reset', () => {
    const stopped = raisedThenStopped({ 'raiseLower.memoryAtStop': 'reset' })
    expect(ref(stopped)).toBe(5)
  })

  const raisedThenPowerCycled = (settings: SimulationSetup['settings']) => {
    const stopped = raisedThenStopped({ 'raiseLower.memoryAtStop': 'keep', ...settings })
    // Off long enough for the electronics to go dark, then on again.
    return advance(
      run(stopped, [
        { t: 17_000, type: 'power.off' },
        { t: 60_000, type: 'power.on' },
      ]),
      5000,
    )
  }

  it('keeps the reference through a power loss when set to keep (retained value)', () => {
    expect(ref(raisedThenPowerCycled({ 'raiseLower.memoryAtPowerLoss': 'keep' }))).toBeCloseTo(15, 9)
  })

  it('returns to minimum speed after a power loss when set to reset', () => {
    expect(ref(raisedThenPowerCycled({ 'raiseLower.memoryAtPowerLoss': 'reset' }))).toBe(5)
  })
})
