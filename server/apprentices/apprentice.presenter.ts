// The pieces of an apprentice's record: an assignment under their terms, an attempt with its time spent
// and safety violations in words, and the learning outcomes met.
import type { ApprenticeAssignment, ApprenticeAttempt, ApprenticeRecord } from '@shared/api/apprentices'
import type { AssignmentRow, AttemptRow, ScenarioRow } from '../entities'
import type { Standing } from '../gradebook/standings'

export type RecordAttemptRow = Pick<
  AttemptRow,
  | 'id'
  | 'assignmentId'
  | 'scenarioId'
  | 'status'
  | 'startedAt'
  | 'updatedAt'
  | 'submittedAt'
  | 'score'
  | 'passed'
  | 'late'
  | 'autoScore'
  | 'autoPassed'
  | 'reviewedAt'
  | 'evidence'
>

export const presentApprenticeAssignment = (
  a: AssignmentRow,
  cohortName: string,
  s: Standing,
): ApprenticeAssignment => ({
  assignmentId: a.id,
  cohortId: a.cohortId,
  cohortName,
  title: a.title,
  opensAt: a.opensAt,
  dueAt: a.dueAt,
  ownDueAt: s.terms.dueAt,
  extended: s.terms.extended,
  attemptLimit: s.terms.attemptLimit,
  status: s.status,
  score: s.bestScore,
  attempts: s.attempts,
})

export function presentApprenticeAttempt(
  row: RecordAttemptRow,
  related: {
    assignmentTitle: string | null
    scenarioTitle: string
    violations: { kind: string; text: string }[]
    now: string
  },
): ApprenticeAttempt {
  const end = row.submittedAt ?? row.updatedAt
  return {
    id: row.id,
    assignmentId: row.assignmentId,
    assignmentTitle: related.assignmentTitle,
    scenarioTitle: related.scenarioTitle,
    status: row.status,
    startedAt: row.startedAt,
    submittedAt: row.submittedAt,
    score: row.score,
    passed: row.passed === null ? null : Boolean(row.passed),
    late: Boolean(row.late),
    overridden:
      row.score !== null && (row.score !== row.autoScore || Boolean(row.passed) !== Boolean(row.autoPassed)),
    reviewed: row.reviewedAt !== null,
    minutes: Math.max(0, (Date.parse(end) - Date.parse(row.startedAt)) / 60_000),
    violations: related.violations,
  }
}

/**
 * Each scenario's learning outcomes (from its newest version among those involved), met when the first
 * passed attempt of any version of it was submitted. Scenarios assigned but never passed list theirs unmet.
 */
export function presentOutcomes(
  scenarios: Pick<ScenarioRow, 'id' | 'key' | 'version' | 'title' | 'document'>[],
  attempts: RecordAttemptRow[],
): ApprenticeRecord['outcomes'] {
  const newest = new Map<string, (typeof scenarios)[number]>()
  for (const s of scenarios) if ((newest.get(s.key)?.version ?? 0) < s.version) newest.set(s.key, s)
  const keyOf = new Map(scenarios.map((s) => [s.id, s.key]))
  const firstPass = new Map<string, RecordAttemptRow>()
  for (const a of attempts) {
    if (a.status !== 'submitted' || !a.passed || !a.submittedAt) continue
    const key = keyOf.get(a.scenarioId)!
    const earlier = firstPass.get(key)
    if (!earlier || a.submittedAt < earlier.submittedAt!) firstPass.set(key, a)
  }
  const outcomes: ApprenticeRecord['outcomes'] = []
  for (const [key, scenario] of newest) {
    let texts: string[] = []
    try {
      texts = (JSON.parse(scenario.document) as { learningOutcomes?: string[] }).learningOutcomes ?? []
    } catch {
      texts = []
    }
    const pass = firstPass.get(key)
    for (const text of texts) {
      outcomes.push({
        text,
        scenarioTitle: scenario.title,
        metAt: pass?.submittedAt ?? null,
        attemptId: pass?.id ?? null,
      })
    }
  }
  return outcomes.sort((a, b) => (a.metAt ?? '~').localeCompare(b.metAt ?? '~'))
}
