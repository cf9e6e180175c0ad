// One safety rule: the live warnings are the grader's own violations, returned by push at the moment
// the work happens. Every terminal work the grader counts (wire added or removed, contact block fitted,
// fuse replaced, motor-cable conductor landed or lifted, motor cable replaced) done while energised,
// without a lock or before proving dead (on each pair's own voltage range) raises a warning then.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { applyEvent, createSimulation, readDrive, type AttemptEvent } from '@shared/model'
import {
  createLiveGrader,
  grade,
  toSimulationSetup,
  type SafetyViolation,
  type Scenario,
} from '@shared/scenario'
import { freshLog, mutatedLog } from './arbitraryLogs'
import { BUS_PAIR, LINE_PAIRS } from './builders/procedures'
import {
  attemptFixtures,
  benchScenario,
  builderFor,
  fixtureScenarioIds,
  ready,
  shippedScenario,
} from './helpers'

const fixtures = attemptFixtures()

const TERMINAL_WORK = new Set([
  'wire.added',
  'wire.removed',
  'device.contactFitted',
  'fuse.replaced',
  'motor.conductorLanded',
  'motor.cableReplaced',
])
/** NEC 460.6: capacitors discharged to 50 V or less before work. */
const SAFE_BUS_VOLTS = 50

/**
 * The events that are terminal work on an energised drive, found from the model alone: the supply
 * disconnect on, or the DC bus above 50 V, just before the event.
 */
function energisedWork(scenario: Scenario, events: readonly AttemptEvent[]): number[] {
  let state = createSimulation(toSimulationSetup(scenario))
  const found: number[] = []
  events.forEach((event, i) => {
    if (TERMINAL_WORK.has(event.type)) {
      const before = readDrive(
        applyEvent(state, { t: event.t, type: 'meter.probes', red: null, black: null }),
      )
      if (before.lineOn || before.busVolts > SAFE_BUS_VOLTS) found.push(i)
    }
    state = applyEvent(state, event)
  })
  return found
}

/** Each event's live warnings, and the grade's violations. */
function warnings(scenario: Scenario, events: readonly AttemptEvent[]) {
  const live = createLiveGrader(scenario)
  const byEvent = events.map((event) => live.push(event).violations)
  return { byEvent, graded: grade(scenario, events).safetyViolations }
}

function expectOneRule(scenario: Scenario, events: readonly AttemptEvent[]): void {
  const { byEvent, graded } = warnings(scenario, events)
  // Every violation the grade lists was a live warning, at the push of its own event, in order.
  expect(byEvent.flat()).toEqual(graded)
  byEvent.forEach((found: SafetyViolation[], i) => {
    for (const v of found) expect(v.t).toBe(events[i]!.t)
    const work = found.filter((v) => v.kind !== 'ohmmeterOnLiveCircuit')
    if (work.length > 0) expect(TERMINAL_WORK.has(events[i]!.type)).toBe(true)
    // The meter's own violation comes only from turning the selector or moving a probe.
    if (work.length < found.length) expect(events[i]!.type).toMatch(/^meter\./)
  })
  // And every energised terminal work is among them.
  for (const i of energisedWork(scenario, events)) {
    expect(
      byEvent[i]!.map((v) => v.kind),
      `${events[i]!.type} at ${events[i]!.t} ms`,
    ).toContain('workWhileEnergised')
  }
}

describe('one safety rule', () => {
  it.each(fixtures.map((f) => [`${f.scenario}--${f.name}`, f] as const))(
    '%s: every violation the grade lists is a live warning at its moment',
    (_name, fixture) => expectOneRule(shippedScenario(fixture.scenario), fixture.events),
  )

  it.each(fixtureScenarioIds(fixtures))('%s: the same on generated logs', (id) => {
    const scenario = shippedScenario(id)
    const bases = fixtures.filter((f) => f.scenario === id).map((f) => f.events)
    fc.assert(
      fc.property(fc.oneof(freshLog(scenario, 60), ...bases.map((b) => mutatedLog(scenario, b))), (events) =>
        expectOneRule(scenario, events),
      ),
      { numRuns: 25 },
    )
  })

  it('warns live for a fuse replaced, a contact block fitted and motor-cable work on a live drive, not only for wiring', () => {
    // The fan station starts powered and unlocked.
    const scenario = shippedScenario('fan-ramp-or-coast')
    const events: AttemptEvent[] = [
      { t: 1000, type: 'meter.probes', red: null, black: null },
      { t: 5000, type: 'fuse.replaced' },
      { t: 6000, type: 'device.contactFitted', device: 'runSwitch', contact: 'NC' },
      { t: 7000, type: 'motor.conductorLanded', conductor: 'v', terminal: null },
      { t: 8000, type: 'motor.conductorLanded', conductor: 'v', terminal: 'v1' },
      { t: 9000, type: 'motor.cableReplaced' },
    ]
    const { byEvent } = warnings(scenario, events)
    expect(byEvent[0]).toEqual([])
    for (const [i, what] of [
      [1, /^Control fuse replaced at 00:05\.0 while the supply disconnect was on\.$/],
      [
        2,
        /^A normally closed contact block fitted to Fan run \/ stop at 00:06\.0 while the supply disconnect was on\.$/,
      ],
      [3, /^Motor-cable conductor V lifted at 00:07\.0 while the supply disconnect was on\.$/],
      [4, /^Motor-cable conductor V landed on V1 at 00:08\.0 while the supply disconnect was on\.$/],
      [5, /^Motor cable replaced at 00:09\.0 while the supply disconnect was on\.$/],
    ] as const) {
      expect(byEvent[i]!.map((v) => v.kind)).toEqual([
        'workWhileEnergised',
        'workWithoutLock',
        'workWithoutProvingDead',
      ])
      expect(byEvent[i]![0]!.text).toMatch(what)
    }
  })

  it('records resistance or continuity tried across a live circuit, and not across a dead one', () => {
    // The fan station starts powered: +24 to 0V carries the control supply (24 V DC).
    const scenario = shippedScenario('fan-ramp-or-coast')
    const events: AttemptEvent[] = [
      { t: 1000, type: 'meter.mode', mode: 'resistance' },
      { t: 2000, type: 'meter.probes', red: 'drive.p24', black: 'drive.0v' },
      { t: 3000, type: 'meter.mode', mode: 'continuity' },
      { t: 4000, type: 'meter.mode', mode: 'dcVolts' },
      { t: 5000, type: 'meter.probes', red: null, black: null },
    ]
    const { byEvent, graded } = warnings(scenario, events)
    expect(byEvent.map((v) => v.map((x) => x.kind))).toEqual([
      [],
      ['ohmmeterOnLiveCircuit'],
      ['ohmmeterOnLiveCircuit'],
      [],
      [],
    ])
    expect(byEvent[1]![0]!.text).toMatch(
      /^Meter on resistance across a live circuit at 00:02\.0, probes on \+24/,
    )
    expect(graded.map((v) => v.kind)).toEqual(['ohmmeterOnLiveCircuit', 'ohmmeterOnLiveCircuit'])
  })

  it('does not warn for work on an isolated, locked and proved-dead drive', () => {
    const fixture = fixtures.find((f) => f.scenario === 'two-wire-run-stop' && f.name === 'reference')!
    const { byEvent } = warnings(shippedScenario(fixture.scenario), fixture.events)
    expect(fixture.events.some((e) => TERMINAL_WORK.has(e.type))).toBe(true)
    expect(byEvent.flat()).toEqual([])
  })

  it('counts a dead test only on the range that shows what the pair could carry', () => {
    // V DC across a line pair reads about 0 V even when the line is live: it proves nothing.
    const scenario = benchScenario([{ id: 'locked', kind: 'lockBeforeWiring', title: 'Locked', weight: 1 }])
    const workAfterDeadTest = (lineRange: 'acVolts' | 'dcVolts') => {
      const b = builderFor(scenario)
      ready(b).powerOff().wait(1000).lock().wait(1000)
      b.waitUntil((d) => d.busVolts < 15, 'the bus discharging', 1000)
      for (const [red, black] of LINE_PAIRS) b.measure(red, black, lineRange).wait(2000)
      b.measure(...BUS_PAIR, 'dcVolts').wait(2000)
      b.unwire('wLowerOut')
      return warnings(scenario, b.events).byEvent.flat()
    }
    expect(workAfterDeadTest('dcVolts').map((v) => v.kind)).toEqual(['workWithoutProvingDead'])
    expect(workAfterDeadTest('acVolts')).toEqual([])
  })
})
