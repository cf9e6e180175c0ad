// The live grader folds each event into running objective state; whatever it is asked along the way,
// its result equals the batch grade of the events so far, judged at the same moment: for every fixture
// log at many cut points, and for generated logs.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { gradeResultSchema } from '@shared/api'
import type { AttemptEvent } from '@shared/model'
import { createLiveGrader, grade, GradeInputError, type Scenario } from '@shared/scenario'
import { freshLog, mutatedLog } from './arbitraryLogs'
import {
  atSpeed,
  benchScenario,
  builderFor,
  ready,
  attemptFixtures,
  fixtureScenarioIds,
  shippedScenario,
} from './helpers'

const fixtures = attemptFixtures()

/** Later moments to judge at: the last event itself, a millisecond on, a live tick, minutes on. */
const LATER = [0, 1500, 600_000]

/** Pushes every event, comparing with the batch grade of the prefix at each cut point. */
function expectLiveEqualsBatch(scenario: Scenario, events: readonly AttemptEvent[], every: number): void {
  const live = createLiveGrader(scenario)
  expect(live.result()).toEqual(grade(scenario, []))
  events.forEach((event, i) => {
    live.push(event)
    expect(live.eventCount).toBe(i + 1)
    if (i % every !== 0 && i !== events.length - 1) return
    const prefix = events.slice(0, i + 1)
    for (const later of LATER) {
      const endAt = event.t + later
      expect(live.result(endAt), `after event ${i}, judged at ${endAt} ms`).toEqual(
        grade(scenario, prefix, { endAt }),
      )
    }
  })
  // Asking along the way changed nothing: a grader fed the whole log at once says the same.
  expect(live.result()).toEqual(createLiveGrader(scenario, events).result())
  expect(live.result()).toEqual(grade(scenario, events))
}

describe('live grader', () => {
  it.each(fixtures.map((f) => [`${f.scenario}--${f.name}`, f] as const))(
    '%s: equals the batch grade after each of many cut points',
    (_name, fixture) => {
      const scenario = shippedScenario(fixture.scenario)
      expectLiveEqualsBatch(scenario, fixture.events, Math.max(1, Math.floor(fixture.events.length / 15)))
    },
  )

  it.each(fixtureScenarioIds(fixtures))('%s: equals the batch grade on generated logs', (id) => {
    const scenario = shippedScenario(id)
    const bases = fixtures.filter((f) => f.scenario === id).map((f) => f.events)
    fc.assert(
      fc.property(
        fc.oneof(freshLog(scenario), ...bases.map((b) => mutatedLog(scenario, b))),
        fc.integer({ min: 2, max: 8 }),
        (events, every) => expectLiveEqualsBatch(scenario, events, every),
      ),
      { numRuns: 8 },
    )
  })

  it('gives results that parse with the API schema', () => {
    const fixture = fixtures.find((f) => f.name === 'mistake-rewired-live')!
    const live = createLiveGrader(shippedScenario(fixture.scenario), fixture.events)
    expect(gradeResultSchema.parse(live.result())).toEqual(live.result())
  })

  it('refuses an event earlier than the one before, and keeps what it had', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const live = createLiveGrader(scenario, [{ t: 5000, type: 'power.on' }])
    const before = live.result(6000)
    expect(() => live.push({ t: 4000, type: 'power.off' })).toThrow(GradeInputError)
    expect(() => live.push({ t: 5000.5, type: 'power.off' })).toThrow(/whole number of milliseconds/)
    expect(() => live.result(-1)).toThrow(GradeInputError)
    expect(live.eventCount).toBe(1)
    expect(live.result(6000)).toEqual(before)
  })

  it('judges a live tick at that moment: a motor reaching speed after the last event holds it', () => {
    // Nothing happens after the run switch is turned on: the drive ramps up and runs on. The ramp's
    // end is a model breakpoint, so the time at speed is exact, not interpolated from the last event.
    const scenario = benchScenario([
      {
        id: 'held',
        title: 'Runs at 10 Hz',
        weight: 1,
        kind: 'speedHeld',
        target: 10,
        unit: 'Hz',
        tolerance: 0.5,
        holdSeconds: 5,
      },
    ])
    const b = ready(builderFor(scenario)).switchTo('runSwitch', 1)
    const events = b.events.slice()
    const switchedOn = b.t
    const reached = b.waitUntil(atSpeed, 'at speed').t
    const live = createLiveGrader(scenario, events)
    const soon = live.result(reached + 1000).objectives[0]!
    const later = live.result(reached + 6000).objectives[0]!
    expect(soon.met).toBe(false)
    expect(later.met).toBe(true)
    expect(later.at).toBeGreaterThan(switchedOn)
    expect(later.at).toBeLessThanOrEqual(reached)
    expect(later).toEqual(grade(scenario, events, { endAt: reached + 6000 }).objectives[0])
  })

  it('judges an earlier endAt at the last event, as grade does', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const events: AttemptEvent[] = [{ t: 5000, type: 'power.on' }]
    expect(createLiveGrader(scenario, events).result(1000)).toEqual(grade(scenario, events, { endAt: 1000 }))
    expect(createLiveGrader(scenario, events).result(1000).endedAt).toBe(5000)
  })
})
