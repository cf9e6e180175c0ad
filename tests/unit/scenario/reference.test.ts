// referenceResult: how an author's recorded run fares on a scenario (what the publish gate reads), and the
// shipped reference solutions in scenarios/reference-solutions, each of which must score full marks.
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { attemptLogSchema, type AttemptEvent } from '@shared/model'
import { referenceResult, referenceShortfall } from '@shared/scenario/reference'
import { attemptFixtures, shippedScenario } from './helpers'
import { serialiseReferenceSolution } from './builders/buildFixtures'

const solutionsDir = resolve(import.meta.dirname, '../../../scenarios/reference-solutions')
const scenarioIds = readdirSync(resolve(import.meta.dirname, '../../../scenarios'))
  .filter((f) => f.endsWith('.json'))
  .map((f) => f.replace(/\.json$/, ''))
const fixture = (scenario: string, name: string) =>
  attemptFixtures().find((f) => f.scenario === scenario && f.name === name)!
const shippedSolution = (id: string): AttemptEvent[] =>
  attemptLogSchema.parse(JSON.parse(readFileSync(resolve(solutionsDir, `${id}.json`), 'utf8')).events)

describe('the shipped reference solutions', () => {
  it.each(scenarioIds)('%s has one, and it scores full marks on its scenario', (id) => {
    const result = referenceResult(shippedScenario(id), shippedSolution(id))
    expect(result.missed).toEqual([])
    expect(result).toMatchObject({ fullMarks: true, passed: true, score: 100, safetyViolations: 0 })
    expect(result.pointsEarned).toBe(result.pointsPossible)
    expect(referenceShortfall(result)).toBeNull()
  })

  it.each(scenarioIds)('%s is the reference fixture as npm run fixtures:build writes it', (id) => {
    const text = readFileSync(resolve(solutionsDir, `${id}.json`), 'utf8')
    expect(JSON.parse(text)).toEqual(JSON.parse(serialiseReferenceSolution(fixture(id, 'reference').events)))
  })
})

describe('referenceResult', () => {
  it('names the objective a mistaken run misses, by title, and is not full marks', () => {
    const scenario = shippedScenario('potentiometer-reference')
    const mistake = fixture('potentiometer-reference', 'mistake-low-end-not-wired')
    const result = referenceResult(scenario, mistake.events)
    const titles = scenario.objectives.filter((o) => mistake.misses.includes(o.id)).map((o) => o.title)
    expect(titles).toHaveLength(1)
    expect(result.fullMarks).toBe(false)
    expect(result.missed).toEqual(titles)
    expect(result.pointsEarned).toBeLessThan(result.pointsPossible)
    expect(referenceShortfall(result)).toBe(`The reference solution misses 1 objective: ${titles[0]}.`)
  })

  it('is not full marks when a hint was revealed, even with every objective met', () => {
    const run = fixture('raise-lower-commissioning', 'reference-with-hint')
    const result = referenceResult(shippedScenario('raise-lower-commissioning'), run.events)
    expect(run.events.some((e) => e.type === 'hint.revealed')).toBe(true)
    expect(result.missed).toEqual([])
    expect(result.fullMarks).toBe(false)
    expect(referenceShortfall(result)).toMatch(/a hint was used/)
  })

  it('reports a run that cannot be replayed in words, without throwing', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const events = structuredClone(fixture('two-wire-run-stop', 'reference').events)
    // Out of time order: the model refuses the log.
    events.push({ ...events.at(-1)!, t: 0 })
    const result = referenceResult(scenario, events)
    expect(result.fullMarks).toBe(false)
    expect(result.problem).toMatch(/cannot be replayed/)
    expect(result.missed).toHaveLength(scenario.objectives.length)
    expect(referenceShortfall(result)).toBe(result.problem)
  })

  it('scores an empty run as missing what the apprentice must bring about', () => {
    const scenario = shippedScenario('safe-isolation')
    const result = referenceResult(scenario, [])
    expect(result.fullMarks).toBe(false)
    expect(result.missed).toContain(scenario.objectives.find((o) => o.kind === 'isolated')!.title)
  })
})
