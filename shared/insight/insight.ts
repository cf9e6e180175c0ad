// Class insight, computed from submitted attempts: most-missed objectives, safety violations by kind,
// attempts and wall-clock time to pass. Pure: the server reads the rows, this counts them.
import type { AssignmentInsight, CohortInsight, SafetyKindCount } from '../api/insight'
import { safetyViolationLabel } from '../progress/words'
import { median } from './average'

export interface InsightAttempt {
  userId: string
  startedAt: string
  /** Only submitted attempts count; one without a submission time is left out. */
  submittedAt: string | null
  /** The grade that counts (an override included). */
  passed: boolean | null
  /** From the grader's evidence (an attempt graded by an older grader may have none). */
  objectives: { id: string; met: boolean }[]
  /** Each safety violation's kind, as the grader names it. */
  violations: string[]
}

export interface InsightInput {
  assignmentId: string
  title: string
  /** The scenario version's objectives, in its own order. */
  objectives: { id: string; title: string; required: boolean }[]
  /** Who the work is set for (excused apprentices and those it is not set for are left out). */
  setFor: string[]
  attempts: InsightAttempt[]
}

/** Labels of the "passed at attempt n" buckets; the last holds n and more. */
export const ATTEMPT_BUCKETS = ['1st', '2nd', '3rd', '4th', '5th or later'] as const

const minutesBetween = (from: string, to: string) => Math.max(0, (Date.parse(to) - Date.parse(from)) / 60_000)

function submittedBy(input: InsightInput): Map<string, InsightAttempt[]> {
  const setFor = new Set(input.setFor)
  const byUser = new Map<string, InsightAttempt[]>()
  for (const a of input.attempts) {
    if (!a.submittedAt || !setFor.has(a.userId)) continue
    byUser.set(a.userId, [...(byUser.get(a.userId) ?? []), a])
  }
  for (const list of byUser.values()) list.sort((a, b) => a.submittedAt!.localeCompare(b.submittedAt!))
  return byUser
}

function objectiveMisses(input: InsightInput, byUser: Map<string, InsightAttempt[]>) {
  return input.objectives
    .map((o) => {
      let graded = 0
      let missed = 0
      let notMetBy = 0
      for (const attempts of byUser.values()) {
        const results = attempts.flatMap((a) => a.objectives.filter((r) => r.id === o.id))
        graded += results.length
        missed += results.filter((r) => !r.met).length
        if (results.length && !results.some((r) => r.met)) notMetBy++
      }
      return {
        title: o.title,
        required: o.required,
        graded,
        missed,
        missRate: graded ? missed / graded : null,
        notMetBy,
      }
    })
    .sort((a, b) => (b.missRate ?? -1) - (a.missRate ?? -1) || b.missed - a.missed)
}

function safetyByKind(attempts: InsightAttempt[]): { safety: SafetyKindCount[]; unsafeAttempts: number } {
  const kinds = new Map<string, { violations: number; attempts: Set<InsightAttempt>; users: Set<string> }>()
  for (const a of attempts) {
    for (const kind of a.violations) {
      const label = safetyViolationLabel(kind)
      const k = kinds.get(label) ?? { violations: 0, attempts: new Set(), users: new Set() }
      k.violations++
      k.attempts.add(a)
      k.users.add(a.userId)
      kinds.set(label, k)
    }
  }
  const safety = [...kinds.entries()]
    .map(([label, k]) => ({
      label,
      violations: k.violations,
      attempts: k.attempts.size,
      apprentices: k.users.size,
    }))
    .sort((a, b) => b.violations - a.violations || a.label.localeCompare(b.label))
  const unsafeAttempts = attempts.filter((a) => a.violations.length > 0).length
  return { safety, unsafeAttempts }
}

function toPass(input: InsightInput, byUser: Map<string, InsightAttempt[]>): AssignmentInsight['toPass'] {
  const attemptsNeeded: number[] = []
  const minutesNeeded: number[] = []
  let notYet = 0
  for (const attempts of byUser.values()) {
    const first = attempts.findIndex((a) => a.passed)
    if (first < 0) {
      notYet++
      continue
    }
    const upToPass = attempts.slice(0, first + 1)
    attemptsNeeded.push(upToPass.length)
    minutesNeeded.push(upToPass.reduce((sum, a) => sum + minutesBetween(a.startedAt, a.submittedAt!), 0))
  }
  const byAttempts = ATTEMPT_BUCKETS.map((label, i) => ({
    label,
    apprentices: attemptsNeeded.filter((n) => Math.min(n, ATTEMPT_BUCKETS.length) === i + 1).length,
  }))
  return {
    passed: attemptsNeeded.length,
    notYet,
    notAttempted: new Set(input.setFor).size - byUser.size,
    medianAttempts: median(attemptsNeeded),
    medianMinutes: median(minutesNeeded),
    byAttempts,
  }
}

export function assignmentInsight(input: InsightInput): AssignmentInsight {
  const byUser = submittedBy(input)
  const submitted = [...byUser.values()].flat()
  return {
    assignmentId: input.assignmentId,
    title: input.title,
    apprentices: new Set(input.setFor).size,
    submittedAttempts: submitted.length,
    objectives: objectiveMisses(input, byUser),
    ...safetyByKind(submitted),
    toPass: toPass(input, byUser),
  }
}

/** Every assignment of a cohort (in the order given), their most-missed objectives and safety together. */
export function cohortInsight(cohortId: string, inputs: InsightInput[], topObjectives = 10): CohortInsight {
  const each = inputs.map((input) => ({ input, insight: assignmentInsight(input) }))
  const objectives = each
    .flatMap(({ insight }) => insight.objectives.map((o) => ({ ...o, assignmentTitle: insight.title })))
    .filter((o) => o.missed > 0)
    .sort((a, b) => b.missRate! - a.missRate! || b.missed - a.missed)
    .slice(0, topObjectives)
  const submitted = each.flatMap(({ input }) => [...submittedBy(input).values()].flat())
  // An apprentice counts once per kind over the whole cohort.
  const { safety, unsafeAttempts } = safetyByKind(submitted)
  return {
    cohortId,
    assignments: each.map(({ insight }) => ({
      assignmentId: insight.assignmentId,
      title: insight.title,
      apprentices: insight.apprentices,
      submittedAttempts: insight.submittedAttempts,
      unsafeAttempts: insight.unsafeAttempts,
      toPass: insight.toPass,
    })),
    objectives,
    safety,
    submittedAttempts: submitted.length,
    unsafeAttempts,
  }
}
