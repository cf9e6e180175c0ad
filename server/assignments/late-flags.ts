// An attempt's `late` flag is stored (the gradebook sums on-time and late attempts apart in the database),
// so it is worked out again whenever a due date that decides it moves: the assignment's, or an
// apprentice's own through an exception.
import type { EntityManager } from 'typeorm'
import { isLate, personalTerms } from '@shared/progress'
import { AttemptEntity, type AssignmentRow } from '../entities'
import { apprenticeFacts, assignmentTerms } from '../gradebook/standings'

/** Sets `late` on every submitted attempt of the assignment (of one apprentice, if given) by its due date. */
export async function refreshLateFlags(
  manager: EntityManager,
  assignment: AssignmentRow,
  userId?: string,
): Promise<void> {
  const attempts = await manager.getRepository(AttemptEntity).find({
    where: { assignmentId: assignment.id, status: 'submitted', ...(userId ? { userId } : {}) },
    select: { id: true, userId: true, submittedAt: true, late: true },
  })
  if (!attempts.length) return
  const facts = await apprenticeFacts(manager, [assignment], userId)
  const terms = assignmentTerms(assignment)
  for (const attempt of attempts) {
    const late = isLate(personalTerms(terms, facts.facts(assignment, attempt.userId)), attempt.submittedAt!)
    if (late !== Boolean(attempt.late))
      await manager.getRepository(AttemptEntity).update({ id: attempt.id }, { late })
  }
}
