// Data-level access rules, in one place: apprentices see their own work and their cohorts,
// instructors their own cohorts, admins everything. Missing → 404, present but not yours → 403.
import type { DataSource } from 'typeorm'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  type AssignmentRow,
  type AttemptRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { forbidden, notFound } from '../http-error'
import { findById } from '../infrastructure/database/lookups'

export async function isEnrolled(ds: DataSource, cohortId: string, userId: string) {
  return (await ds.getRepository(EnrollmentEntity).countBy({ cohortId, userId })) > 0
}

export async function cohortFor(
  ds: DataSource,
  user: UserRow,
  cohortId: string,
  mode: 'read' | 'manage',
): Promise<CohortRow> {
  const cohort = await findById(ds, CohortEntity, cohortId)
  if (!cohort) throw notFound('Cohort')
  if (user.role === 'admin') return cohort
  if (user.role === 'instructor' && cohort.ownerId === user.id) return cohort
  if (mode === 'read' && user.role === 'apprentice' && (await isEnrolled(ds, cohort.id, user.id)))
    return cohort
  throw forbidden(mode === 'manage' ? 'Only the cohort’s instructor can do this' : 'This cohort is not yours')
}

export async function assignmentFor(
  ds: DataSource,
  user: UserRow,
  assignmentId: string,
  mode: 'read' | 'manage',
): Promise<{ assignment: AssignmentRow; cohort: CohortRow }> {
  const assignment = await ds.getRepository(AssignmentEntity).findOneBy({ id: assignmentId })
  if (!assignment) throw notFound('Assignment')
  const cohort = await cohortFor(ds, user, assignment.cohortId, mode)
  return { assignment, cohort }
}

/** Read: the owner, the instructor of the assignment's cohort, or an admin. Manage: instructor or admin. */
export async function attemptFor(
  ds: DataSource,
  user: UserRow,
  attemptId: string,
  mode: 'read' | 'manage',
): Promise<AttemptRow> {
  const attempt = await ds.getRepository(AttemptEntity).findOneBy({ id: attemptId })
  if (!attempt) throw notFound('Attempt')
  if (user.role === 'admin') return attempt
  if (mode === 'read' && attempt.userId === user.id) return attempt
  if (user.role === 'instructor' && attempt.assignmentId) {
    const assignment = await ds.getRepository(AssignmentEntity).findOneBy({ id: attempt.assignmentId })
    const cohort = assignment && (await ds.getRepository(CohortEntity).findOneBy({ id: assignment.cohortId }))
    if (cohort?.ownerId === user.id) return attempt
  }
  throw forbidden('This attempt is not yours')
}

/** Cohort ids a user may read: enrolled (apprentice), owned (instructor), all (admin → undefined). */
export async function readableCohortIds(ds: DataSource, user: UserRow): Promise<string[] | undefined> {
  if (user.role === 'admin') return undefined
  if (user.role === 'instructor') {
    return (await ds.getRepository(CohortEntity).findBy({ ownerId: user.id })).map((c) => c.id)
  }
  return (await ds.getRepository(EnrollmentEntity).findBy({ userId: user.id })).map((e) => e.cohortId)
}
