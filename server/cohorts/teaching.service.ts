// Who teaches a cohort, and carrying a cohort over to its next intake.
// Co-instructors manage the cohort as its owner does (members, assignments, gradebook, reviews); only the
// owner (or an admin) decides who else teaches it. A co-instructor may leave on their own.
import { randomUUID } from 'node:crypto'
import { In, type EntityManager } from 'typeorm'
import type { z } from 'zod'
import type {
  AddCoInstructorRequest,
  CohortInstructor,
  copyCohortRequestSchema,
  CopyCohortResult,
} from '@shared/api/cohorts'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AuditEntryEntity,
  CohortEntity,
  CohortInstructorEntity,
  UserEntity,
  type AssignmentRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { conflict, forbidden, HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { presentCohortFor } from './cohorts.service'

type CopyCohort = z.output<typeof copyCohortRequestSchema>

const DAY_MS = 24 * 3600 * 1000

async function audit(
  manager: EntityManager,
  actor: UserRow,
  action: string,
  cohortId: string,
  toValue: unknown,
  reason: string,
) {
  await manager.getRepository(AuditEntryEntity).insert({
    id: randomUUID(),
    actorId: actor.id,
    action,
    entityType: 'cohort',
    entityId: cohortId,
    fromValue: null,
    toValue: JSON.stringify(toValue),
    reason,
    createdAt: nowIso(),
  })
}

function mayChooseInstructors(user: UserRow, cohort: CohortRow): boolean {
  return user.role === 'admin' || cohort.ownerId === user.id
}

export async function listInstructors(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<CohortInstructor[]> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  const links = await ds.getRepository(CohortInstructorEntity).findBy({ cohortId: cohort.id })
  const people = await ds
    .getRepository(UserEntity)
    .findBy({ id: In([cohort.ownerId, ...links.map((l) => l.userId)]) })
  const person = (id: string) => people.find((p) => p.id === id)
  const owner = person(cohort.ownerId)
  const co = links
    .map((l) => ({ link: l, who: person(l.userId) }))
    .filter((x) => x.who !== undefined)
    .map(({ link, who }) => ({
      userId: who!.id,
      name: who!.name,
      email: who!.email,
      owner: false,
      since: link.createdAt,
    }))
    .sort((a, b) => a.name.localeCompare(b.name))
  return [
    ...(owner
      ? [{ userId: owner.id, name: owner.name, email: owner.email, owner: true, since: cohort.createdAt }]
      : []),
    ...co,
  ]
}

export async function addCoInstructor(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  { email }: AddCoInstructorRequest,
): Promise<CohortInstructor> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  if (!mayChooseInstructors(user, cohort))
    throw forbidden('Only the cohort’s own instructor or an admin can choose who else teaches it')
  const colleague = await ds.getRepository(UserEntity).findOneBy({ email })
  if (colleague?.role !== 'instructor' || !colleague.active) {
    throw new HttpError(400, 'validation_failed', 'No active instructor account has this address', {
      fields: { email: ['No active instructor account has this address'] },
    })
  }
  if (colleague.id === cohort.ownerId)
    throw conflict('conflict', `${colleague.name} already teaches this cohort`)
  const links = ds.getRepository(CohortInstructorEntity)
  if (await links.countBy({ cohortId: cohort.id, userId: colleague.id }))
    throw conflict('conflict', `${colleague.name} already teaches this cohort`)
  const since = nowIso()
  await ds.transaction(async (manager) => {
    await manager
      .getRepository(CohortInstructorEntity)
      .insert({ id: randomUUID(), cohortId: cohort.id, userId: colleague.id, createdAt: since })
    await audit(
      manager,
      user,
      'cohort.coInstructorAdded',
      cohort.id,
      { userId: colleague.id },
      'Added as a co-instructor',
    )
  })
  return { userId: colleague.id, name: colleague.name, email: colleague.email, owner: false, since }
}

export async function removeCoInstructor(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  instructorId: string,
): Promise<void> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  const leaving = instructorId === user.id
  if (!leaving && !mayChooseInstructors(user, cohort))
    throw forbidden('Only the cohort’s own instructor or an admin can choose who else teaches it')
  if (instructorId === cohort.ownerId) {
    throw conflict(
      'conflict',
      'The cohort’s own instructor cannot be removed; an admin can hand the cohort over',
    )
  }
  await ds.transaction(async (manager) => {
    const removed = await manager
      .getRepository(CohortInstructorEntity)
      .delete({ cohortId: cohort.id, userId: instructorId })
    if (!removed.affected) throw notFound('Co-instructor')
    await audit(
      manager,
      user,
      'cohort.coInstructorRemoved',
      cohort.id,
      { userId: instructorId },
      leaving ? 'Left the cohort' : 'Removed as a co-instructor',
    )
  })
}

const shifted = (iso: string, days: number) => new Date(Date.parse(iso) + days * DAY_MS).toISOString()

/**
 * A new cohort with the same assignments and practice choices, dates moved by whole days (so a due time of
 * 17:00 stays 17:00 except across a daylight-saving change, where it keeps the same UTC instant). The copy
 * belongs to the instructor who makes it; an admin's copy keeps the original owner.
 */
export async function copyCohort(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  body: CopyCohort,
): Promise<CopyCohortResult> {
  const ds = ctx.dataSource
  const source = await cohortFor(ds, user, cohortId, 'manage')
  const assignments = await ds.getRepository(AssignmentEntity).findBy({ cohortId: source.id })
  const carried = assignments.filter((a) => a.audience !== 'selected')
  const coInstructors = body.coInstructors
    ? await ds.getRepository(CohortInstructorEntity).findBy({ cohortId: source.id })
    : []
  const now = nowIso()
  const ownerId = user.role === 'admin' ? source.ownerId : user.id
  const copy: CohortRow = {
    id: randomUUID(),
    name: body.name,
    description: body.description ?? source.description,
    ownerId,
    archived: false,
    createdAt: now,
    practiceKeys: source.practiceKeys ?? null,
  }
  // Teachers of the source who are not the new owner; the source's owner too when someone else copies.
  const teachers = new Set(coInstructors.map((c) => c.userId))
  if (body.coInstructors && source.ownerId !== ownerId) teachers.add(source.ownerId)
  teachers.delete(ownerId)
  await ds.transaction(async (manager) => {
    await manager.getRepository(CohortEntity).insert(copy)
    const rows: AssignmentRow[] = carried.map((a) => ({
      ...a,
      id: randomUUID(),
      cohortId: copy.id,
      opensAt: shifted(a.opensAt, body.shiftDays),
      dueAt: shifted(a.dueAt, body.shiftDays),
      createdById: user.id,
      createdAt: now,
    }))
    // One row at a time: a multi-row insert of rows with column defaults gets its rows mixed up on SQLite.
    for (const row of rows) await manager.getRepository(AssignmentEntity).insert(row)
    for (const userId of teachers) {
      await manager
        .getRepository(CohortInstructorEntity)
        .insert({ id: randomUUID(), cohortId: copy.id, userId, createdAt: now })
    }
    await audit(
      manager,
      user,
      'cohort.copied',
      copy.id,
      {
        from: source.id,
        shiftDays: body.shiftDays,
        assignments: rows.length,
      },
      `Copied from ${source.name} for a new intake`,
    )
  })
  return {
    cohort: await presentCohortFor(ctx, copy),
    assignmentsCopied: carried.length,
    assignmentsLeftOut: assignments.length - carried.length,
  }
}
