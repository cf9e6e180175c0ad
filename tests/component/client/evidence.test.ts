// The attempt pages read the grader's real result (shared/scenario grade), not a shape of our own.
import { describe, expect, it } from 'vitest'
import { grade, scenarioSchema } from '@shared/scenario'
import safeIsolation from '../../../scenarios/safe-isolation.json'
import { readEvidence } from '@/components/attempts/evidence'

describe('reading the grader’s evidence', () => {
  const scenario = scenarioSchema.parse(safeIsolation)
  const result = grade(scenario, [{ t: 0, type: 'attempt.ended' }] as never)

  it('lists every objective with its points and the grader’s own words', () => {
    const view = readEvidence(result)
    expect(view.objectives).toHaveLength(scenario.objectives.length)
    view.objectives.forEach((line, i) => {
      const source = result.objectives[i]
      expect(line).toMatchObject({
        id: source.id,
        title: source.title,
        passed: source.met,
        points: source.pointsEarned,
        possible: source.pointsPossible,
        detail: source.evidence,
        required: source.required,
      })
    })
    expect(view.summary).toBe(result.summary)
  })

  it('keeps safety violations and hints apart from the objectives', () => {
    const withViolation = {
      ...result,
      safetyViolations: [
        { kind: 'workWhileEnergised', t: 42_300, text: 'Wire added while the DC bus was at 512 V' },
      ],
      hintsUsed: [{ id: 'hint-bus', t: 1000, cost: 10 }],
    }
    const view = readEvidence(withViolation)
    expect(view.violations).toEqual([{ atMs: 42_300, text: 'Wire added while the DC bus was at 512 V' }])
    expect(view.hints).toEqual([{ id: 'hint-bus', cost: 10, atMs: 1000 }])
  })

  it('shows nothing rather than failing for an empty or unknown result', () => {
    expect(readEvidence(null)).toEqual({ objectives: [], violations: [], hints: [], summary: '' })
    expect(readEvidence('garbled').objectives).toEqual([])
  })
})
