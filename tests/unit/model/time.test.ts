// Time is exact: advancing in tiny steps or in one jump gives the same state, because every
// continuous quantity is a closed-form piece between breakpoints.
import { describe, expect, it } from 'vitest'
import { advance, readDrive, type SimState } from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

function stepwise(state: SimState, steps: number, stepMs: number): SimState {
  let s = state
  for (let i = 0; i < steps; i++) s = advance(s, stepMs)
  return s
}

function expectSameReadings(a: SimState, b: SimState) {
  const ra = readDrive(a)
  const rb = readDrive(b)
  expect(ra.control).toBe(rb.control)
  expect(ra.power).toBe(rb.power)
  for (const key of ['busVolts', 'outputHz', 'referenceHz', 'speedRpm', 'targetHz'] as const) {
    expect(Math.abs(ra[key] - rb[key])).toBeLessThan(1e-9)
  }
}

describe('step-size independence', () => {
  it('gives the same state for 1 ms × 100 000 and 100 s at once while raising, ramping and clamping', () => {
    const raising = run(start(), [
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
      { t: 0, type: 'device.pressed', device: 'raisePb' },
    ])
    const jump = advance(raising, 100_000)
    const steps = stepwise(raising, 100_000, 1)
    expect(steps.t).toBe(jump.t)
    expectSameReadings(steps, jump)
    expect(readDrive(jump).referenceHz).toBe(50) // clamped at maximum on the way
  })

  it('gives the same state through power-off, electronics dropping out and bus discharge', () => {
    const s = run(start(), [
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
      { t: 0, type: 'device.pressed', device: 'raisePb' },
      { t: 3000, type: 'power.off' },
    ])
    expectSameReadings(stepwise(s, 100_000, 1), advance(s, 100_000))
    expect(JSON.stringify(stepwise(s, 1000, 100))).toBe(JSON.stringify(advance(s, 100_000)))
  })

  it('gives the same state through a power-up: charging, electronics waking, then accelerating', () => {
    const base = raiseLowerSetup({
      power: { on: false, locked: false },
      settings: { ...raiseLowerSetup().settings, 'stop.mode': 'coast' },
    })
    const s = run(start(base), [
      { t: 0, type: 'power.on' },
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    expectSameReadings(stepwise(s, 100_000, 1), advance(s, 100_000))
  })

  it('refuses a step that is not a whole number of milliseconds', () => {
    expect(() => advance(start(), 0.5)).toThrow(/whole milliseconds/)
    expect(() => advance(start(), -1)).toThrow(/whole milliseconds/)
  })
})
