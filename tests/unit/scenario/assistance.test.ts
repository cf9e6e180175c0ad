// The grade's hint cost follows the attempt's assistance level: free when guided, at the scenario's cost at
// standard (and in an assessment, where the server refuses hints before grading). The live grader agrees.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import {
  ASSISTANCE_LEVEL_INFO,
  ASSISTANCE_LEVEL_KEYS,
  assistanceLevelSchema,
  assistanceRules,
  createLiveGrader,
  grade,
  levelFromHintsAllowed,
} from '@shared/scenario'
import type { AttemptFixture } from './builders/buildFixtures'
import { shippedScenario } from './helpers'

const fixture = JSON.parse(
  readFileSync(
    resolve(
      import.meta.dirname,
      '../../fixtures/attempts/raise-lower-commissioning--reference-with-hint.json',
    ),
    'utf8',
  ),
) as AttemptFixture
const scenario = shippedScenario(fixture.scenario)
const revealed = new Set(fixture.events.flatMap((e) => (e.type === 'hint.revealed' ? [e.hintId] : [])))
const hintCost = scenario.hints.filter((h) => revealed.has(h.id)).reduce((a, h) => a + h.cost, 0)
const possible = scenario.objectives.reduce((a, o) => a + o.weight, 0)

describe('assistance levels in the grade', () => {
  it('the fixture reveals a hint that costs something (else this test could not fail)', () => {
    expect(revealed.size).toBeGreaterThan(0)
    expect(hintCost).toBeGreaterThan(0)
  })

  it('charges the hint at standard, the default', () => {
    const expected = Math.round((100 * (possible - hintCost)) / possible)
    for (const result of [
      grade(scenario, fixture.events),
      grade(scenario, fixture.events, { assistance: 'standard' }),
    ]) {
      expect(result.points.hintCost).toBe(hintCost)
      expect(result.score).toBe(expected)
      expect(result.hintsUsed.map((h) => h.cost).reduce((a, b) => a + b, 0)).toBe(hintCost)
    }
  })

  it('makes the hint free when guided, and still lists it as used', () => {
    const result = grade(scenario, fixture.events, { assistance: 'guided' })
    expect(result.points.hintCost).toBe(0)
    expect(result.score).toBe(100)
    expect(result.hintsUsed.map((h) => h.id).sort()).toEqual([...revealed].sort())
  })

  it('the live grader charges as the batch grade at each level', () => {
    for (const assistance of ASSISTANCE_LEVEL_KEYS) {
      const live = createLiveGrader(scenario, fixture.events, { assistance }).result()
      expect(live).toEqual(grade(scenario, fixture.events, { assistance }))
    }
  })
})

describe('the levels themselves', () => {
  it('each has a label and a one-line description, and the rules the issue asks for', () => {
    for (const key of ASSISTANCE_LEVEL_KEYS) {
      expect(ASSISTANCE_LEVEL_INFO[key].label).toMatch(/^[A-Z][a-z]+$/)
      expect(ASSISTANCE_LEVEL_INFO[key].description).not.toContain('\n')
    }
    expect(assistanceRules('guided')).toEqual({
      liveValues: true,
      alarmFix: true,
      hints: true,
      liveTicks: true,
      hintsCost: false,
    })
    expect(assistanceRules('standard')).toMatchObject({
      liveValues: false,
      alarmFix: false,
      hints: true,
      hintsCost: true,
    })
    expect(assistanceRules('assessment')).toMatchObject({ liveValues: false, hints: false, liveTicks: false })
  })

  it('reads an older assignment’s hint rule as a level, and refuses an unknown level in words', () => {
    expect(levelFromHintsAllowed(false)).toBe('assessment')
    expect(levelFromHintsAllowed(true)).toBe('standard')
    const bad = assistanceLevelSchema.safeParse('expert')
    expect(bad.success).toBe(false)
    expect(bad.error?.issues[0]?.message).toContain('Choose an assistance level')
  })
})
