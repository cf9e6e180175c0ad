// Exceptions for some apprentices on one assignment (their own due date, extra attempts, or excused, each
// with the instructor's reason), and the list of the cohort's apprentices under their own terms that the
// assignment page shows. The rules that apply an exception live in shared/progress (personalTerms).
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import type { AssignmentApprentice, ExceptionRequest } from '@shared/api/assignments'
import { assignmentFor } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentExceptionEntity,
  EnrollmentEntity,
  UserEntity,
  type AssignmentExceptionRow,
  type AssignmentRow,
  type UserRow,
} from '../entities'
import { apprenticeFacts, pairKey, standingsFor } from '../gradebook/standings'
import { HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { refreshLateFlags } from './late-flags'

async function memberIds(ctx: AppContext, assignment: AssignmentRow): Promise<string[]> {
  const members = await ctx.dataSource
    .getRepository(EnrollmentEntity)
    .findBy({ cohortId: assignment.cohortId })
  return members.map((m) => m.userId)
}

/** Every apprentice of the assignment's cohort, by name, with where they stand and any exception. */
export async function listAssignmentApprentices(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
): Promise<AssignmentApprentice[]> {
  const ds = ctx.dataSource
  const { assignment } = await assignmentFor(ds, user, assignmentId, 'manage')
  const ids = await memberIds(ctx, assignment)
  if (!ids.length) return []
  const people = await ds.getRepository(UserEntity).find({
    where: { id: In(ids) },
    select: { id: true, name: true, email: true },
    order: { name: 'ASC' },
  })
  const standings = await standingsFor(ds, [assignment], ids, nowIso())
  const facts = await apprenticeFacts(ds, [assignment])
  return people.map((person) => {
    const s = standings.get(pairKey(assignment.id, person.id))!
    const exception = facts.exception(assignment.id, person.id)
    return {
      userId: person.id,
      name: person.name,
      email: person.email,
      assigned: s.terms.assigned,
      status: s.status,
      score: s.bestScore,
      attempts: s.attempts,
      dueAt: s.terms.dueAt,
      extended: s.terms.extended,
      attemptLimit: s.terms.attemptLimit,
      extraAttempts: exception?.extraAttempts ?? 0,
      excused: s.terms.excused,
      reason: exception?.reason ?? '',
    }
  })
}

/** An exception that changes nothing is no exception: its row goes. */
const isEmpty = (row: Pick<AssignmentExceptionRow, 'dueAt' | 'extraAttempts' | 'excused'>) =>
  row.dueAt === null && row.extraAttempts === 0 && !row.excused

/**
 * Sets the same exception for every apprentice named (fields left out keep what each already has), and
 * decides again which of their attempts were late. All or nothing: one non-member refuses the lot.
 */
export async function setExceptions(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
  body: ExceptionRequest,
): Promise<AssignmentApprentice[]> {
  const ds = ctx.dataSource
  const { assignment } = await assignmentFor(ds, user, assignmentId, 'manage')
  const members = new Set(await memberIds(ctx, assignment))
  const userIds = [...new Set(body.userIds)]
  const outsiders = userIds.filter((id) => !members.has(id))
  if (outsiders.length) {
    throw new HttpError(400, 'validation_failed', 'Exceptions are only for members of the cohort', {
      fields: { userIds: [`${outsiders.length} of those chosen are not members of this cohort`] },
    })
  }
  if (body.dueAt && Date.parse(body.dueAt) <= Date.parse(assignment.opensAt)) {
    throw new HttpError(400, 'validation_failed', 'The due date must be after the assignment opens', {
      fields: { dueAt: ['The due date must be after the assignment opens'] },
    })
  }
  await ds.transaction(async (manager) => {
    const repo = manager.getRepository(AssignmentExceptionEntity)
    const existing = await repo.findBy({ assignmentId: assignment.id, userId: In(userIds) })
    const now = nowIso()
    for (const userId of userIds) {
      const before = existing.find((e) => e.userId === userId)
      const next: AssignmentExceptionRow = {
        id: before?.id ?? randomUUID(),
        assignmentId: assignment.id,
        userId,
        dueAt: body.dueAt === undefined ? (before?.dueAt ?? null) : body.dueAt,
        extraAttempts: body.extraAttempts ?? before?.extraAttempts ?? 0,
        excused: body.excused ?? Boolean(before?.excused),
        reason: body.reason,
        createdById: user.id,
        updatedAt: now,
      }
      if (isEmpty(next)) {
        if (before) await repo.delete({ id: before.id })
      } else if (before) {
        const { id: _id, ...fields } = next
        await repo.update({ id: before.id }, fields)
      } else {
        await repo.insert(next)
      }
    }
    // Their own due dates decide which of their attempts were late.
    if (body.dueAt !== undefined) await refreshLateFlags(manager, assignment)
  })
  return listAssignmentApprentices(ctx, user, assignmentId)
}

/** Puts one apprentice back on the assignment's own terms. */
export async function clearException(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
  userId: string,
): Promise<void> {
  const ds = ctx.dataSource
  const { assignment } = await assignmentFor(ds, user, assignmentId, 'manage')
  await ds.transaction(async (manager) => {
    const result = await manager
      .getRepository(AssignmentExceptionEntity)
      .delete({ assignmentId: assignment.id, userId })
    if (!result.affected) throw notFound('Exception')
    await refreshLateFlags(manager, assignment, userId)
  })
}
