// Data-level access rules, in one place: apprentices see their own work and their cohorts,
// instructors their own cohorts, admins everything. Missing → 404, present but not yours → 403.
import type { DataSource } from 'typeorm'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  CohortInstructorEntity,
  EnrollmentEntity,
  UserEntity,
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

/** Whether the user teaches the cohort: its owner or one of its co-instructors. */
export async function teaches(ds: DataSource, cohort: CohortRow, userId: string): Promise<boolean> {
  if (cohort.ownerId === userId) return true
  return (await ds.getRepository(CohortInstructorEntity).countBy({ cohortId: cohort.id, userId })) > 0
}

/** The ids of the cohorts an instructor teaches: owned and co-taught. */
export async function taughtCohortIds(ds: DataSource, userId: string): Promise<string[]> {
  const owned = await ds.getRepository(CohortEntity).findBy({ ownerId: userId })
  const shared = await ds.getRepository(CohortInstructorEntity).findBy({ userId })
  return [...new Set([...owned.map((c) => c.id), ...shared.map((c) => c.cohortId)])]
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
  if (user.role === 'instructor' && (await teaches(ds, cohort, user.id))) return cohort
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
    if (cohort && (await teaches(ds, cohort, user.id))) return attempt
  }
  // Free practice belongs to no cohort: the instructors of the apprentice's cohorts may read it.
  if (user.role === 'instructor' && !attempt.assignmentId && mode === 'read') {
    if ((await taughtCohortsOf(ds, user, attempt.userId)).length) return attempt
  }
  throw forbidden('This attempt is not yours')
}

/** The cohorts an apprentice is enrolled in that the user manages (every one of them for an admin). */
export async function taughtCohortsOf(
  ds: DataSource,
  user: UserRow,
  apprenticeId: string,
): Promise<{ cohortId: string; enrolledAt: string }[]> {
  const enrolments = await ds.getRepository(EnrollmentEntity).findBy({ userId: apprenticeId })
  const managed = await managedCohortIds(ds, user)
  return enrolments
    .filter((e) => managed === undefined || managed.includes(e.cohortId))
    .map((e) => ({ cohortId: e.cohortId, enrolledAt: e.createdAt }))
}

/**
 * An apprentice as their instructors may see them: missing (or not an apprentice) → 404, in none of the
 * caller's cohorts → 403. Returns the cohorts of theirs the caller teaches.
 */
export async function apprenticeFor(ds: DataSource, user: UserRow, apprenticeId: string) {
  const apprentice = await findById(ds, UserEntity, apprenticeId)
  if (!apprentice || apprentice.role !== 'apprentice') throw notFound('Apprentice')
  const cohorts = await taughtCohortsOf(ds, user, apprentice.id)
  if (user.role !== 'admin' && !cohorts.length) throw forbidden('This apprentice is in none of your cohorts')
  return { apprentice, cohorts }
}

/** Cohort ids a user manages: those an instructor teaches; every cohort for an admin (undefined). */
export async function managedCohortIds(ds: DataSource, user: UserRow): Promise<string[] | undefined> {
  if (user.role === 'admin') return undefined
  if (user.role !== 'instructor') return []
  return taughtCohortIds(ds, user.id)
}

/** Cohort ids a user may read: enrolled (apprentice), taught (instructor), all (admin → undefined). */
export async function readableCohortIds(ds: DataSource, user: UserRow): Promise<string[] | undefined> {
  if (user.role === 'admin') return undefined
  if (user.role === 'instructor') return taughtCohortIds(ds, user.id)
  return (await ds.getRepository(EnrollmentEntity).findBy({ userId: user.id })).map((e) => e.cohortId)
}
