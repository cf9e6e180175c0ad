// Class insight: most-missed objectives, safety violations by kind, attempts and wall-clock time to pass.
// Worked by hand on a small class; invariants checked on random classes with fast-check.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  ATTEMPT_BUCKETS,
  assignmentInsight,
  cohortInsight,
  type InsightAttempt,
  type InsightInput,
} from '../../../shared/insight/insight'

const OBJECTIVES = [
  { id: 'lock', title: 'Lock and tag applied', required: true },
  { id: 'prove', title: 'Absence of voltage proved', required: true },
  { id: 'ramp', title: 'Ramp time set', required: false },
]

const at = (minute: number) => new Date(Date.UTC(2026, 10, 2, 8, minute)).toISOString()
function attempt(
  userId: string,
  start: number,
  end: number | null,
  passed: boolean,
  missed: string[] = [],
  violations: string[] = [],
): InsightAttempt {
  return {
    userId,
    startedAt: at(start),
    submittedAt: end === null ? null : at(end),
    passed,
    objectives: OBJECTIVES.map((o) => ({ id: o.id, met: !missed.includes(o.id) })),
    violations,
  }
}

const input = (attempts: InsightAttempt[], setFor = ['ada', 'abel', 'bea', 'cy']): InsightInput => ({
  assignmentId: '6d1e2f30-4a5b-4c6d-8e7f-8091a2b3c4d5',
  title: 'Safe isolation',
  objectives: OBJECTIVES,
  setFor,
  attempts,
})

// Ada: fails (no proof, live work), then passes: 2 attempts, 10 + 20 minutes.
// Abel: passes at once in 15 minutes. Bea: fails twice on the proof, never meets it. Cy: nothing.
const CLASS = [
  attempt('ada', 0, 10, false, ['prove', 'ramp'], ['workWhileEnergised', 'workWithoutProvingDead']),
  attempt('ada', 30, 50, true),
  attempt('abel', 0, 15, true, ['ramp']),
  attempt('bea', 0, 5, false, ['prove'], ['workWithoutProvingDead']),
  attempt('bea', 10, 25, false, ['prove']),
  attempt('bea', 40, null, false, ['prove']), // still in progress: not counted
  attempt('zed', 0, 10, false, ['lock']), // not set for Zed (excused): not counted
]

describe('the insight of one assignment', () => {
  const insight = assignmentInsight(input(CLASS))

  it('counts only submitted attempts by the apprentices the work is set for', () => {
    expect(insight.apprentices).toBe(4)
    expect(insight.submittedAttempts).toBe(5)
  })

  it('orders objectives by the share of attempts that missed them, and counts who never met one', () => {
    expect(insight.objectives.map((o) => o.title)).toEqual([
      'Absence of voltage proved',
      'Ramp time set',
      'Lock and tag applied',
    ])
    expect(insight.objectives[0]).toMatchObject({
      graded: 5,
      missed: 3,
      missRate: 3 / 5,
      notMetBy: 1,
      required: true,
    })
    expect(insight.objectives[1]).toMatchObject({ missed: 2, notMetBy: 1 })
    expect(insight.objectives[2]).toMatchObject({ missed: 0, missRate: 0, notMetBy: 0 })
  })

  it('counts safety violations by kind, in words, with the attempts and apprentices concerned', () => {
    expect(insight.safety).toEqual([
      { label: 'Work before proving dead', violations: 2, attempts: 2, apprentices: 2 },
      { label: 'Work on live terminals', violations: 1, attempts: 1, apprentices: 1 },
    ])
    expect(insight.unsafeAttempts).toBe(2)
    expect(JSON.stringify(insight)).not.toMatch(/workWith|workWhile/)
  })

  it('takes attempts and wall-clock minutes up to the first pass', () => {
    expect(insight.toPass).toMatchObject({ passed: 2, notYet: 1, notAttempted: 1 })
    // Ada 2 attempts (10 + 20 min), Abel 1 (15 min): medians of two values are their means.
    expect(insight.toPass.medianAttempts).toBe(1.5)
    expect(insight.toPass.medianMinutes).toBe(22.5)
    expect(insight.toPass.byAttempts.map((b) => b.apprentices)).toEqual([1, 1, 0, 0, 0])
  })

  it('puts a pass at the sixth attempt in the last bucket, and a pass after it does not count again', () => {
    const tries = Array.from({ length: 7 }, (_, i) => attempt('ada', i * 10, i * 10 + 5, i >= 5))
    const r = assignmentInsight(input(tries, ['ada']))
    expect(r.toPass.byAttempts.at(-1)).toEqual({ label: ATTEMPT_BUCKETS.at(-1), apprentices: 1 })
    expect(r.toPass.medianAttempts).toBe(6)
    expect(r.toPass.medianMinutes).toBe(30)
  })

  it('says nothing it cannot know for a class with no attempts', () => {
    const r = assignmentInsight(input([]))
    expect(r.objectives.every((o) => o.missRate === null)).toBe(true)
    expect(r.toPass).toMatchObject({ passed: 0, notAttempted: 4, medianAttempts: null, medianMinutes: null })
    expect(r.safety).toEqual([])
  })
})

describe('the insight of a cohort', () => {
  it('joins its assignments: the most missed objectives with their assignment, and safety over all', () => {
    const second = {
      ...input([attempt('abel', 0, 5, false, ['lock'], ['workWithoutLock'])]),
      title: 'Two-wire control',
    }
    const r = cohortInsight('6d1e2f30-4a5b-4c6d-8e7f-8091a2b3c4d5', [input(CLASS), second], 2)
    expect(r.assignments.map((a) => a.title)).toEqual(['Safe isolation', 'Two-wire control'])
    expect(r.objectives).toHaveLength(2)
    expect(r.objectives[0]).toMatchObject({
      title: 'Lock and tag applied',
      assignmentTitle: 'Two-wire control',
      missRate: 1,
    })
    expect(r.objectives[1]).toMatchObject({
      title: 'Absence of voltage proved',
      assignmentTitle: 'Safe isolation',
    })
    expect(r.safety.map((s) => s.label)).toEqual([
      'Work before proving dead',
      'Work on live terminals',
      'Work without a lock applied',
    ])
    expect(r.submittedAttempts).toBe(6)
    expect(r.unsafeAttempts).toBe(3)
  })
})

describe('invariants on any class', () => {
  const people = ['a', 'b', 'c', 'd', 'e']
  const anAttempt = fc.record({
    userId: fc.constantFrom(...people),
    start: fc.integer({ min: 0, max: 500 }),
    length: fc.integer({ min: 0, max: 120 }),
    submitted: fc.boolean(),
    passed: fc.boolean(),
    missed: fc.subarray(OBJECTIVES.map((o) => o.id)),
    violations: fc.array(fc.constantFrom('workWhileEnergised', 'workWithoutLock', 'workWithoutProvingDead'), {
      maxLength: 3,
    }),
  })

  it('accounts for every apprentice once and never counts more misses than grades', () => {
    fc.assert(
      fc.property(
        fc.array(anAttempt, { maxLength: 40 }),
        fc.subarray(people, { minLength: 1 }),
        (raw, setFor) => {
          const attempts = raw.map((a) =>
            attempt(
              a.userId,
              a.start,
              a.submitted ? a.start + a.length : null,
              a.passed,
              a.missed,
              a.violations,
            ),
          )
          const r = assignmentInsight(input(attempts, setFor))
          const { passed, notYet, notAttempted, byAttempts } = r.toPass
          expect(passed + notYet + notAttempted).toBe(setFor.length)
          expect(byAttempts.reduce((n, b) => n + b.apprentices, 0)).toBe(passed)
          for (const o of r.objectives) {
            expect(o.missed).toBeLessThanOrEqual(o.graded)
            expect(o.graded).toBe(r.submittedAttempts)
            expect(o.notMetBy).toBeLessThanOrEqual(setFor.length)
          }
          expect(r.safety.reduce((n, s) => n + s.attempts, 0)).toBeGreaterThanOrEqual(r.unsafeAttempts)
          if (r.toPass.medianAttempts !== null) expect(r.toPass.medianAttempts).toBeGreaterThanOrEqual(1)
        },
      ),
    )
  })
})
