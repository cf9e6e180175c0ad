// The grade result has one shape, in shared/api: the grader's types are inferred from the schema,
// the attempt responses carry it, and grades already stored in attempts rows still parse.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { attemptGradeSchema, gradeResultSchema } from '@shared/api'
import { grade } from '@shared/scenario'
import { attemptFixtures, shippedScenario } from '../scenario/helpers'

const fixturesDir = resolve(import.meta.dirname, '../../fixtures')
const stored = JSON.parse(
  readFileSync(resolve(fixturesDir, 'grades/stored-before-typed-evidence.json'), 'utf8'),
) as { grades: Record<string, unknown> }
const attempts = attemptFixtures()

describe('grade result schema', () => {
  it.each(Object.entries(stored.grades))('parses the stored grade %s unchanged', (_name, evidence) => {
    expect(gradeResultSchema.parse(evidence)).toEqual(evidence)
    const row = {
      score: 50,
      passed: false,
      autoScore: 50,
      autoPassed: false,
      overridden: false,
      overrideReason: null,
      evidence,
      gradedAt: '2026-11-30T09:00:00.000Z',
    }
    expect(attemptGradeSchema.parse(row).evidence).toEqual(evidence)
  })

  it('the stored grades cover every objective kind, violations and hints', () => {
    const grades = Object.values(stored.grades).map((g) => gradeResultSchema.parse(g))
    expect(new Set(grades.flatMap((g) => g.objectives.map((o) => o.kind))).size).toBe(15)
    expect(grades.some((g) => g.safetyViolations.length > 0)).toBe(true)
    expect(grades.some((g) => g.hintsUsed.length > 0)).toBe(true)
  })

  it.each(attempts.map((f) => [`${f.scenario}--${f.name}`, f] as const))(
    'keeps every field of what the grader gives for %s',
    (_name, fixture) => {
      const result = grade(shippedScenario(fixture.scenario), fixture.events)
      expect(gradeResultSchema.parse(JSON.parse(JSON.stringify(result)))).toEqual(result)
    },
  )

  it('refuses what is not a grade', () => {
    const good = Object.values(stored.grades)[0] as Record<string, unknown>
    for (const bad of [
      { ...good, score: 120 },
      { ...good, objectives: undefined },
      { ...good, safetyViolations: [{ kind: 'somethingElse', t: 0, text: 'x' }] },
      { ...good, objectives: [{ id: 'a', kind: 'notAKind' }] },
      'garbled',
    ]) {
      expect(gradeResultSchema.safeParse(bad).success).toBe(false)
    }
    expect(attemptGradeSchema.shape.evidence.safeParse(null).success).toBe(true)
  })
})
