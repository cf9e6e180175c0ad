// People read words, not identifiers: every text the grader writes (objective evidence, safety
// messages, the summary, live warnings) reaches screens and printed records, so it names things as the
// panel does: wires by marker number, devices and terminals by label, settings by catalogue label.
// Graded for every fixture log, at the end and at live ticks along the way, and for generated logs;
// any internal identifier fails.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { SAFETY_VIOLATION_KINDS } from '@shared/api'
import {
  INPUT_FUNCTIONS,
  SETTINGS,
  SETTING_KEYS,
  controlPointsFor,
  DRIVE_POWER_POINTS,
  METER_MODES,
  MOTOR_POINTS,
  PROVER_POINTS,
  type AttemptEvent,
} from '@shared/model'
import { createLiveGrader, grade, OBJECTIVE_KINDS, type GradeResult, type Scenario } from '@shared/scenario'
import { freshLog, mutatedLog } from './arbitraryLogs'
import { attemptFixtures, fixtureScenarioIds, shippedScenario } from './helpers'

const fixtures = attemptFixtures()

/** Ids and keys that are not words: the scenario's own, the catalogue's, the grader's enums. */
function identifiersOf(scenario: Scenario, events: readonly AttemptEvent[]): string[] {
  const notAWord = (value: string) => /[A-Z.\-_$\d]/.test(value.slice(1)) || /^[a-z]+[A-Z]/.test(value)
  const choiceValues = SETTINGS.flatMap((s) =>
    s.kind === 'choice' ? s.options.map((o) => String(o.value)).filter((v) => isNaN(Number(v))) : [],
  )
  return [
    scenario.id,
    ...scenario.start.devices.map((d) => d.id),
    ...scenario.start.wires.map((w) => w.id),
    ...events.flatMap((e) => (e.type === 'wire.added' || e.type === 'wire.removed' ? [e.id] : [])),
    ...scenario.hints.map((h) => h.id),
    ...scenario.objectives.map((o) => o.id),
    ...controlPointsFor(scenario.start.devices),
    ...DRIVE_POWER_POINTS,
    ...MOTOR_POINTS,
    ...PROVER_POINTS,
    ...METER_MODES,
    ...SETTING_KEYS,
    ...OBJECTIVE_KINDS,
    ...SAFETY_VIOLATION_KINDS,
    ...INPUT_FUNCTIONS,
    ...choiceValues,
    ...new Set(events.map((e) => e.type)),
  ].filter(notAWord)
}

/** Patterns no text for people may contain, whatever the scenario. */
const SHAPES: [string, RegExp][] = [
  ['a camelCase identifier', /\b[a-z]+[A-Z][A-Za-z]*\b/],
  ['a dotted key or event type', /\b[a-zA-Z][a-zA-Z0-9]*\.[a-zA-Z][a-zA-Z0-9]*\b/],
  ['a JSON path', /\$\.|\[\d+\]/],
  ['a wire id (the panel writes W4)', /\bw\d+\b/],
  ['an id in kebab case', /\b[a-z]+(-[a-z0-9]+){2,}\b/],
  ['a value rendered as an object', /\[object |undefined|NaN/],
]

/** Everything a person reads in a grade, with where it came from. */
function texts(result: GradeResult): [string, string][] {
  return [
    ['summary', result.summary],
    ...result.objectives.map((o) => [`objective ${o.id}`, o.evidence] as [string, string]),
    ...result.safetyViolations.map((v) => [`violation at ${v.t} ms`, v.text] as [string, string]),
  ]
}

/** The identifiers or shapes found in a text, if any. */
function identifiersIn(text: string, identifiers: readonly string[]): string[] {
  const found = identifiers.filter((id) => new RegExp(`(^|[^\\w.-])${escape(id)}($|[^\\w-])`).test(text))
  for (const [what, shape] of SHAPES) if (shape.test(text)) found.push(`${what} (${shape.exec(text)![0]})`)
  return found
}

function escape(id: string): string {
  return id.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
}

function expectWords(result: GradeResult, identifiers: readonly string[]): void {
  for (const [where, text] of texts(result))
    expect(identifiersIn(text, identifiers), `${where}: ${text}`).toEqual([])
}

describe('words, not identifiers, in what the grader writes', () => {
  it('the scan finds the identifiers the grader used to write', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const ids = identifiersOf(scenario, [
      { t: 0, type: 'wire.added', id: 'wRunOut', from: 'drive.p24', to: 'runSwitch.a', colour: 'blue' },
    ])
    for (const bad of [
      'Wire wRunOut removed',
      'Contact block fitted to runSwitch',
      'Wire w4 added (+24 to runSwitch.a)',
      'DI2 (raiseLower) was ON',
      'kind wiringCondition',
      'The setting stop.mode is "coast"',
      'After $.objectives[3]',
      'hint two-wire-run-stop',
      'Motor-cable conductor U landed on motor.u1',
      'measured on acVolts',
      'is undefined',
    ]) {
      expect(identifiersIn(bad, ids), bad).not.toEqual([])
    }
    expect(identifiersIn('Wire W4 added from +24 to Fan run / stop terminal 13 at 00:06.0.', ids)).toEqual([])
  })

  it.each(fixtures.map((f) => [`${f.scenario}--${f.name}`, f] as const))(
    '%s: evidence, safety messages and the summary, at the end and at live ticks',
    (_name, fixture) => {
      const scenario = shippedScenario(fixture.scenario)
      const identifiers = identifiersOf(scenario, fixture.events)
      expectWords(grade(scenario, fixture.events), identifiers)
      const live = createLiveGrader(scenario)
      fixture.events.forEach((event, i) => {
        const { violations } = live.push(event)
        for (const v of violations) expect(identifiersIn(v.text, identifiers), v.text).toEqual([])
        if (i % 5 === 0) expectWords(live.result(event.t + 1500), identifiers)
      })
    },
  )

  it.each(fixtureScenarioIds(fixtures))('%s: generated logs', (id) => {
    const scenario = shippedScenario(id)
    const bases = fixtures.filter((f) => f.scenario === id).map((f) => f.events)
    fc.assert(
      fc.property(fc.oneof(freshLog(scenario), ...bases.map((b) => mutatedLog(scenario, b))), (events) => {
        expectWords(grade(scenario, events), identifiersOf(scenario, events))
      }),
      { numRuns: 15 },
    )
  })
})
