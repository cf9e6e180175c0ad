// Every scenario's reference solution scores 100; every typical-mistake log misses exactly the
// objectives it should. The logs are stored fixtures (tests/fixtures/attempts) made by the scripts in
// tests/unit/scenario/builders; the last test checks the stored logs are still what the scripts produce.
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { grade } from '@shared/scenario'
import { attemptLogSchema } from '@shared/model'
import { ATTEMPT_SCRIPTS } from './builders/attempts'
import { buildFixture, fixtureFileName, type AttemptFixture } from './builders/buildFixtures'
import { shippedScenario } from './helpers'

const attemptsDir = resolve(import.meta.dirname, '../../fixtures/attempts')
const scenarioIds = readdirSync(resolve(import.meta.dirname, '../../../scenarios'))
  .filter((f) => f.endsWith('.json'))
  .map((f) => f.replace(/\.json$/, ''))
const fixtures: AttemptFixture[] = readdirSync(attemptsDir)
  .filter((f) => f.endsWith('.json'))
  .sort()
  .map((f) => JSON.parse(readFileSync(resolve(attemptsDir, f), 'utf8')) as AttemptFixture)

function expectedScore(fixture: AttemptFixture): number {
  const scenario = shippedScenario(fixture.scenario)
  const possible = scenario.objectives.reduce((a, o) => a + o.weight, 0)
  // A missed noNeedlessReplacements objective loses costEach per healthy part replaced, up to its weight.
  const lost = scenario.objectives
    .filter((o) => fixture.misses.includes(o.id))
    .reduce(
      (a, o) =>
        a +
        (o.kind === 'noNeedlessReplacements'
          ? Math.min(o.weight, o.costEach * (fixture.needless ?? 0))
          : o.weight),
      0,
    )
  const hintIds = new Set(fixture.events.flatMap((e) => (e.type === 'hint.revealed' ? [e.hintId] : [])))
  const hintCost = scenario.hints.filter((h) => hintIds.has(h.id)).reduce((a, h) => a + h.cost, 0)
  return Math.round((100 * Math.max(0, possible - lost - hintCost)) / possible)
}

describe('attempt fixtures', () => {
  it.each(scenarioIds)('%s has a reference solution and a single-objective mistake log', (id) => {
    const mine = fixtures.filter((f) => f.scenario === id)
    expect(mine.some((f) => f.name === 'reference' && f.misses.length === 0)).toBe(true)
    expect(mine.some((f) => f.name.startsWith('mistake-') && f.misses.length === 1)).toBe(true)
  })

  it.each(fixtures.map((f) => [`${f.scenario} ${f.name}`, f] as const))(
    '%s is a valid attempt log',
    (_name, fixture) => {
      expect(attemptLogSchema.safeParse(fixture.events).success).toBe(true)
      expect(fixture.scenarioVersion).toBe(shippedScenario(fixture.scenario).version)
    },
  )

  it.each(fixtures.filter((f) => f.name === 'reference').map((f) => [f.scenario, f] as const))(
    'the %s reference solution scores 100 and passes',
    (_id, fixture) => {
      const result = grade(shippedScenario(fixture.scenario), fixture.events)
      expect(result.objectives.filter((o) => !o.met).map((o) => `${o.id}: ${o.evidence}`)).toEqual([])
      expect(result.score).toBe(100)
      expect(result.passed).toBe(true)
      expect(result.safetyViolations).toEqual([])
    },
  )

  it.each(fixtures.map((f) => [`${f.scenario} ${f.name}`, f] as const))(
    '%s misses exactly the objectives it should, and scores accordingly',
    (_name, fixture) => {
      const scenario = shippedScenario(fixture.scenario)
      const result = grade(scenario, fixture.events)
      expect(result.objectives.filter((o) => !o.met).map((o) => o.id)).toEqual(fixture.misses)
      expect(result.score).toBe(expectedScore(fixture))
      const requiredMissed = scenario.objectives.some((o) => o.required && fixture.misses.includes(o.id))
      expect(result.passed).toBe(!requiredMissed && result.points.net >= scenario.passMark)
    },
  )

  const troubleshooting = fixtures.filter((f) => f.name === 'mistake-swapped-parts')
  it.each(troubleshooting.map((f) => [f.scenario, f] as const))(
    '%s: swapping parts on a guess, even under lockout, scores below the pass mark',
    (_id, fixture) => {
      const scenario = shippedScenario(fixture.scenario)
      const result = grade(scenario, fixture.events)
      expect(result.passed).toBe(false)
      expect(result.points.net).toBeLessThan(scenario.passMark)
      expect(result.safetyViolations).toEqual([])
      const needless = result.objectives.find((o) => o.kind === 'noNeedlessReplacements')!
      expect(needless.met).toBe(false)
      expect(needless.evidence).toMatch(/^\d healthy parts replaced/)
    },
  )

  it('has a swapped-parts log for every troubleshooting scenario', () => {
    expect(troubleshooting.map((f) => f.scenario).sort()).toEqual([
      'configuration-conflict-alarm',
      'creeping-speed-wrong-contact',
      'dead-control-circuit',
      'inputs-never-on',
    ])
  })

  it.each(
    fixtures
      .filter((f) => f.name === 'mistake-diagnosed-without-measuring')
      .map((f) => [f.scenario, f] as const),
  )('%s: diagnosing without measuring loses only the measurement objectives', (_id, fixture) => {
    const result = grade(shippedScenario(fixture.scenario), fixture.events)
    const missed = result.objectives.filter((o) => !o.met)
    expect(missed.length).toBeGreaterThan(0)
    expect(missed.every((o) => o.kind === 'discriminatingMeasurement')).toBe(true)
    expect(result.objectives.filter((o) => o.kind === 'diagnosisCorrect').every((o) => o.met)).toBe(true)
  })

  it('grades the same log to identical JSON every time', () => {
    const fixture = fixtures.find(
      (f) => f.scenario === 'raise-lower-commissioning' && f.name === 'reference',
    )!
    const scenario = shippedScenario(fixture.scenario)
    const first = JSON.stringify(grade(scenario, fixture.events))
    const second = JSON.stringify(grade(structuredClone(scenario), structuredClone(fixture.events)))
    expect(second).toBe(first)
  })

  it('stores exactly the logs the attempt scripts produce', () => {
    for (const script of ATTEMPT_SCRIPTS) {
      const stored = JSON.parse(
        readFileSync(resolve(attemptsDir, fixtureFileName(script)), 'utf8'),
      ) as AttemptFixture
      expect(stored, `${fixtureFileName(script)} is stale: run npm run fixtures:build`).toEqual(
        buildFixture(script),
      )
    }
    expect(fixtures).toHaveLength(ATTEMPT_SCRIPTS.length)
  })
})
