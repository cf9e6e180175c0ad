// grade(): the score, the pass rule, hints, the separate safety-violation list and the live form.
import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { formatTime, grade, GradeInputError, type Objective } from '@shared/scenario'
import { longestInBand } from '@shared/scenario/evaluators/speed'
import { ModelInputError } from '@shared/model'
import { benchScenario, builderFor, ready } from './helpers'

const objectives: Objective[] = [
  { id: 'safe', kind: 'noWiringWhileEnergised', title: 'No live work', weight: 30, required: true },
  {
    id: 'save',
    kind: 'settingEquals',
    title: 'Coast stop saved',
    weight: 50,
    key: 'stop.mode',
    value: 'coast',
  },
  { id: 'quick', kind: 'finishedWithin', title: 'Within a minute', weight: 20, minutes: 1 },
]
const scenario = benchScenario(objectives, (s) => {
  s.passMark = 50
  s.hints = [
    { id: 'h1', text: 'Look at the stop settings.', cost: 10 },
    { id: 'h2', text: 'Save after changing.', cost: 5 },
  ]
})

describe('grade', () => {
  it('scores the weights of the objectives met out of 100', () => {
    const b = ready(builderFor(scenario)).configure({ 'stop.mode': 'coast' })
    const result = grade(scenario, b.end())
    expect(result.score).toBe(100)
    expect(result.passed).toBe(true)
    expect(result.points).toEqual({ earned: 100, hintCost: 0, net: 100, possible: 100, passMark: 50 })
  })

  it('takes each revealed hint off once, and ignores hint ids the scenario does not have', () => {
    const b = ready(builderFor(scenario))
      .hint('h1')
      .wait(100)
      .hint('h1')
      .hint('h2')
      .hint('nope')
      .configure({ 'stop.mode': 'coast' })
    const result = grade(scenario, b.end())
    expect(result.hintsUsed.map((h) => [h.id, h.cost])).toEqual([
      ['h1', 10],
      ['h2', 5],
    ])
    expect(result.score).toBe(85)
  })

  it('fails an attempt that misses a required objective even when its points reach the pass mark', () => {
    const b = ready(builderFor(scenario))
      .wire('wExtra', 'drive.p24', 'drive.di4')
      .configure({ 'stop.mode': 'coast' })
    const result = grade(scenario, b.end())
    expect(result.score).toBe(70)
    expect(result.points.net).toBeGreaterThanOrEqual(scenario.passMark)
    expect(result.passed).toBe(false)
    expect(result.missedRequired).toEqual(['safe'])
  })

  it('fails an attempt below the pass mark', () => {
    const b = ready(builderFor(scenario)).wait(70_000)
    const result = grade(scenario, b.end())
    expect(result.score).toBe(30)
    expect(result.passed).toBe(false)
  })

  it('lists safety violations separately with the time and the bus voltage', () => {
    const b = ready(builderFor(scenario))
      .powerOff()
      .wait(4000)
      .lock()
      .wait(1000)
      .wire('wExtra', 'drive.p24', 'drive.di4')
    const result = grade(scenario, b.end())
    expect(result.safetyViolations.map((v) => v.kind)).toEqual([
      'workWhileEnergised',
      'workWithoutProvingDead',
    ])
    const [live] = result.safetyViolations
    expect(live.t).toBe(b.events.find((e) => e.type === 'wire.added')!.t)
    expect(live.text).toMatch(
      /^Wire W8 added from \+24 to DI4 at 00:0\d\.\d while the DC bus was at \d{3} V\.$/,
    )
  })

  it('grades a log so far at a later moment for the live panel', () => {
    const b = ready(builderFor(scenario)).configure({ 'stop.mode': 'coast' })
    const events = b.events.slice()
    expect(grade(scenario, events, { endAt: 50_000 }).objectives.find((o) => o.id === 'quick')!.met).toBe(
      true,
    )
    expect(grade(scenario, events, { endAt: 65_000 }).objectives.find((o) => o.id === 'quick')!.met).toBe(
      false,
    )
  })

  it('gives every objective result its points and plain-words evidence', () => {
    const b = ready(builderFor(scenario)).set('stop.mode', 'coast').wait(1000)
    const result = grade(scenario, b.end())
    for (const o of result.objectives) {
      expect(o.pointsPossible).toBe(objectives.find((x) => x.id === o.id)!.weight)
      expect(o.pointsEarned).toBe(o.met ? o.pointsPossible : 0)
      expect(o.evidence.length).toBeGreaterThan(10)
    }
    expect(result.summary).toMatch(/^Passed: 50\/100, 2 of 3 objectives met, no safety violations/)
  })
})

describe('grade refuses a log it cannot replay', () => {
  it('names the event whose time goes back', () => {
    const events = [
      { t: 5000, type: 'power.off' },
      { t: 1000, type: 'power.on' },
    ] as const
    expect(() => grade(scenario, [...events])).toThrow(GradeInputError)
    expect(() => grade(scenario, [...events])).toThrow(ModelInputError)
    expect(() => grade(scenario, [...events])).toThrow(
      'events[1] at 1000 ms is earlier than the event before it (5000 ms)',
    )
  })

  it('names an event whose time is not a whole millisecond', () => {
    expect(() => grade(scenario, [{ t: 5000.5, type: 'power.off' }])).toThrow(
      'events[0].t must be a whole number of milliseconds ≥ 0 (got 5000.5)',
    )
  })
})

describe('formatTime', () => {
  it('writes simulated time as minutes, seconds and tenths', () => {
    expect(formatTime(42_300)).toBe('00:42.3')
    expect(formatTime(0)).toBe('00:00.0')
    expect(formatTime(3_723_400)).toBe('1:02:03.4')
  })
})

describe('time within a speed band', () => {
  it('matches dense sampling of the same piecewise-linear speed', () => {
    // Cross-check of the closed-form interval arithmetic against brute-force sampling every 1 ms.
    const series = fc
      .array(fc.tuple(fc.integer({ min: 1, max: 400 }), fc.integer({ min: 0, max: 60 })), {
        minLength: 2,
        maxLength: 12,
      })
      .map((steps) => {
        let t = 0
        return steps.map(([dt, v]) => ({ t: (t += dt), v }))
      })
    fc.assert(
      fc.property(series, fc.integer({ min: 5, max: 55 }), (points, centre) => {
        const lo = centre - 2.5
        const hi = centre + 2.5
        const exact = longestInBand(points, lo, hi)
        let best = 0
        let run = -1
        for (let t = points[0].t; t <= points[points.length - 1].t; t++) {
          const i = points.findIndex((p) => p.t >= t)
          const a = points[Math.max(0, i - 1)]
          const b = points[i]
          const v = b.t === a.t ? b.v : a.v + ((b.v - a.v) * (t - a.t)) / (b.t - a.t)
          if (v >= lo && v <= hi) {
            if (run < 0) run = t
            best = Math.max(best, t - run)
          } else run = -1
        }
        const exactLength = exact ? exact.to - exact.from : 0
        // Sampling at 1 ms can under-read each end of a stretch by up to 1 ms.
        expect(exactLength).toBeGreaterThanOrEqual(best - 1e-9)
        expect(exactLength).toBeLessThanOrEqual(best + 2 + 1e-9)
      }),
      { numRuns: 200 },
    )
  })
})
