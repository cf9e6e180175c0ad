// Rows of the needs-attention list → the API's shapes: names for ids, work grouped per assignment.
import type { AttentionAttempt, AttentionWork } from '@shared/api/attention'
import type { AssignmentRow, AttemptRow, CohortRow } from '../entities'
import type { Standing } from '../gradebook/standings'

export interface AttentionContext {
  userName: Map<string, string>
  assignment: Map<string, AssignmentRow>
  cohort: Map<string, CohortRow>
}

type AttemptFacts = Pick<
  AttemptRow,
  'id' | 'userId' | 'assignmentId' | 'submittedAt' | 'score' | 'passed' | 'late'
>

export function presentAttentionAttempt(row: AttemptFacts, c: AttentionContext): AttentionAttempt {
  const assignment = c.assignment.get(row.assignmentId!)!
  return {
    attemptId: row.id,
    userId: row.userId,
    userName: c.userName.get(row.userId) ?? '',
    cohortId: assignment.cohortId,
    cohortName: c.cohort.get(assignment.cohortId)?.name ?? '',
    assignmentId: assignment.id,
    assignmentTitle: assignment.title,
    submittedAt: row.submittedAt!,
    score: row.score,
    passed: row.passed === null ? null : Boolean(row.passed),
    late: Boolean(row.late),
  }
}

/** One entry per assignment, people by name, soonest due first (closing) or latest first (missed). */
export function presentAttentionWork(
  pairs: [AssignmentRow, string, Standing][],
  c: AttentionContext,
): AttentionWork[] {
  const byAssignment = new Map<string, AttentionWork>()
  for (const [assignment, userId, standing] of pairs) {
    let work = byAssignment.get(assignment.id)
    if (!work) {
      work = {
        assignmentId: assignment.id,
        title: assignment.title,
        cohortId: assignment.cohortId,
        cohortName: c.cohort.get(assignment.cohortId)?.name ?? '',
        dueAt: assignment.dueAt,
        people: [],
      }
      byAssignment.set(assignment.id, work)
    }
    work.people.push({
      userId,
      name: c.userName.get(userId) ?? '',
      dueAt: standing.terms.dueAt,
      inProgress: standing.status === 'inProgress',
    })
  }
  const collator = new Intl.Collator()
  const works = [...byAssignment.values()]
  for (const w of works) w.people.sort((a, b) => collator.compare(a.name, b.name))
  return works.sort((a, b) => a.dueAt.localeCompare(b.dueAt))
}
