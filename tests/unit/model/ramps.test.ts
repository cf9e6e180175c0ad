// Ramp timing and stopping, against the common-practice ramp definition and IEC 60204-1 9.2.2 stop categories.
import { describe, expect, it } from 'vitest'
import { advance, readDrive, type SimState } from '../../../shared/model/index'
import { control, hz, raiseLowerSetup, run, start } from './fixtures'

/** Keypad-controlled drive with a fixed setpoint, so only the ramps act. */
function keypadDrive(settings: Record<string, unknown> = {}): SimState {
  return start(
    raiseLowerSetup({
      settings: {
        'control.source': 'keypad',
        'reference.keypadSetpoint': 40,
        'speed.min': 0,
        'speed.max': 50,
        'ramp.accelSeconds': 10,
        'ramp.decelSeconds': 4,
        ...settings,
      } as never,
    }),
  )
}

/** First millisecond at which the output reaches `targetHz` (binary search over advance). */
function timeToReach(state: SimState, targetHz: number, rising: boolean): number {
  let lo = 0
  let hi = 600_000
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2)
    const f = hz(advance(state, mid))
    if (rising ? f >= targetHz - 1e-9 : f <= targetHz + 1e-9) hi = mid
    else lo = mid
  }
  return hi
}

describe('linear ramps (times given from zero to maximum speed)', () => {
  it('accelerates 0 → 40 Hz in accel time × 40 / 50 (t = T·Δn/n_max, common practice)', () => {
    const s = run(keypadDrive(), [{ t: 0, type: 'keypad.key', key: 'run' }])
    expect(timeToReach(s, 40, true)).toBe(10_000 * (40 / 50))
  })

  it('is exactly linear on the way: half the time, half the speed', () => {
    const s = run(keypadDrive(), [{ t: 0, type: 'keypad.key', key: 'run' }])
    expect(hz(advance(s, 4000))).toBeCloseTo(20, 9)
    expect(control(advance(s, 4000))).toBe('accelerating')
    expect(control(advance(s, 8000))).toBe('atSpeed')
  })

  it('decelerates 40 → 10 Hz in decel time × 30 / 50', () => {
    const running = advance(run(keypadDrive(), [{ t: 0, type: 'keypad.key', key: 'run' }]), 9000)
    const lowered = run(running, [
      { t: 9000, type: 'setting.changed', key: 'reference.keypadSetpoint', value: 10 },
      { t: 9000, type: 'settings.saved' },
    ])
    expect(control(lowered)).toBe('decelerating')
    expect(timeToReach(lowered, 10, false)).toBe(4000 * (30 / 50))
  })
})

describe('stopping (IEC 60204-1 9.2.2 stop categories)', () => {
  const atSpeed = (stopMode: 'ramp' | 'coast') =>
    advance(run(keypadDrive({ 'stop.mode': stopMode }), [{ t: 0, type: 'keypad.key', key: 'run' }]), 9000)

  it('ramp stop is category 1: power stays on the motor until standstill, then it is removed', () => {
    const stopping = run(atSpeed('ramp'), [{ t: 9000, type: 'keypad.key', key: 'stop' }])
    expect(readDrive(stopping).control).toBe('rampStopping')
    expect(readDrive(stopping).outputOn).toBe(true)
    const halfway = advance(stopping, 1600)
    expect(readDrive(halfway).outputOn).toBe(true)
    expect(hz(halfway)).toBeCloseTo(20, 9)
    const stopped = advance(stopping, 4000 * (40 / 50))
    expect(readDrive(stopped).control).toBe('stopped')
    expect(readDrive(stopped).outputOn).toBe(false)
    expect(hz(stopped)).toBe(0)
  })

  it('coast stop is category 0: power is removed at once and the motor runs down on its own', () => {
    const coasting = run(atSpeed('coast'), [{ t: 9000, type: 'keypad.key', key: 'stop' }])
    expect(readDrive(coasting).control).toBe('coasting')
    expect(readDrive(coasting).outputOn).toBe(false)
    // Coast-down follows the load's time constant (default 4 s): f = f0·e^(−t/τ).
    expect(hz(advance(coasting, 4000))).toBeCloseTo(40 * Math.exp(-1), 9)
  })

  it('counts a coasting motor as stopped below 0.1 Hz (common practice)', () => {
    const coasting = run(atSpeed('coast'), [{ t: 9000, type: 'keypad.key', key: 'stop' }])
    const standstillAfter = Math.ceil(4000 * Math.log(40 / 0.1))
    expect(control(advance(coasting, standstillAfter - 1))).toBe('coasting')
    expect(control(advance(coasting, standstillAfter))).toBe('stopped')
  })
})
