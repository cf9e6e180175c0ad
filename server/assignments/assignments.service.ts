// Assignments: set in a cohort by its instructor (publishing mails every member), seen by its apprentices
// with their own standing; statistics for staff.
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import type {
  Assignment,
  AssignmentStats,
  CreateAssignmentRequest,
  UpdateAssignmentRequest,
} from '@shared/api/assignments'
import { assignmentFor, cohortFor, readableCohortIds } from '../access/access.service'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type UserRow,
} from '../entities'
import { NOT_STARTED, standingsByAssignmentAndUser } from '../gradebook/standings'
import { HttpError, conflict } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { queueMail } from '../infrastructure/mail/mail-job'
import { assignmentPublishedMail } from '../infrastructure/mail/templates'
import { presentAssignment, presentAssignmentStats } from './assignment.presenter'

/** Assignments as the viewer sees them: cohort names, scenario keys, and an apprentice's own standing. */
async function presentAssignments(
  ctx: AppContext,
  rows: AssignmentRow[],
  viewer: UserRow,
): Promise<Assignment[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const cohorts = await ds
    .getRepository(CohortEntity)
    .findBy({ id: In([...new Set(rows.map((r) => r.cohortId))]) })
  const scenarios = await ds.getRepository(ScenarioEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.scenarioId))]) },
    select: { id: true, key: true, version: true },
  })
  const mine =
    viewer.role === 'apprentice'
      ? await standingsByAssignmentAndUser(
          ds,
          rows.map((r) => r.id),
          viewer.id,
        )
      : undefined
  return rows.map((row) =>
    presentAssignment(row, {
      cohortName: cohorts.find((c) => c.id === row.cohortId)?.name ?? '',
      scenario: scenarios.find((s) => s.id === row.scenarioId)!,
      mine: mine ? (mine.get(`${row.id}:${viewer.id}`) ?? NOT_STARTED) : undefined,
    }),
  )
}

async function presentOne(ctx: AppContext, row: AssignmentRow, viewer: UserRow): Promise<Assignment> {
  return (await presentAssignments(ctx, [row], viewer))[0]!
}

/** Every assignment the user may read (or one cohort's); apprentices see none from archived cohorts. */
export async function listAssignments(
  ctx: AppContext,
  user: UserRow,
  { cohortId }: { cohortId?: string },
): Promise<Assignment[]> {
  const ds = ctx.dataSource
  let ids = await readableCohortIds(ds, user)
  if (cohortId) {
    await cohortFor(ds, user, cohortId, 'read')
    ids = [cohortId]
  }
  if (user.role === 'apprentice' && ids?.length) {
    const open = await ds.getRepository(CohortEntity).findBy({ id: In(ids), archived: false })
    ids = open.map((c) => c.id)
  }
  const rows = await ds.getRepository(AssignmentEntity).find({
    where: ids ? { cohortId: In(ids) } : {},
    order: { dueAt: 'ASC' },
  })
  return presentAssignments(ctx, rows, user)
}

/** Publishing tells every active member of the cohort by mail. */
export async function createAssignment(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  body: CreateAssignmentRequest,
): Promise<Assignment> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  if (cohort.archived) throw new HttpError(409, 'cohort_archived', 'This cohort is archived')
  const scenario = await ds.getRepository(ScenarioEntity).findOneBy({ id: body.scenarioId })
  if (!scenario) {
    throw new HttpError(400, 'validation_failed', 'No such scenario version', {
      fields: { scenarioId: ['No such scenario version'] },
    })
  }
  if (scenario.status === 'retired') throw conflict('scenario_retired', 'This scenario is retired')
  const row: AssignmentRow = {
    id: randomUUID(),
    cohortId: cohort.id,
    scenarioId: scenario.id,
    title: body.title || scenario.title,
    opensAt: new Date(body.opensAt).toISOString(),
    dueAt: new Date(body.dueAt).toISOString(),
    attemptLimit: body.attemptLimit,
    hintsAllowed: body.hintsAllowed,
    scorePolicy: body.scorePolicy,
    createdById: user.id,
    createdAt: nowIso(),
  }
  await ds.transaction(async (manager) => {
    await manager.getRepository(AssignmentEntity).insert(row)
    const members = await manager.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
    const people = members.length
      ? await manager.getRepository(UserEntity).findBy({ id: In(members.map((m) => m.userId)), active: true })
      : []
    for (const person of people) {
      await queueMail(
        manager,
        assignmentPublishedMail({
          to: person.email,
          name: person.name,
          title: row.title,
          cohortName: cohort.name,
          dueAt: row.dueAt,
          url: appLink(ctx, `/assignments/${row.id}`),
        }),
      )
    }
  })
  return presentOne(ctx, row, user)
}

export async function getAssignment(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
): Promise<Assignment> {
  const { assignment } = await assignmentFor(ctx.dataSource, user, assignmentId, 'read')
  return presentOne(ctx, assignment, user)
}

export async function updateAssignment(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
  changes: UpdateAssignmentRequest,
): Promise<Assignment> {
  const { assignment } = await assignmentFor(ctx.dataSource, user, assignmentId, 'manage')
  const next: AssignmentRow = {
    ...assignment,
    title: changes.title || assignment.title,
    opensAt: changes.opensAt ? new Date(changes.opensAt).toISOString() : assignment.opensAt,
    dueAt: changes.dueAt ? new Date(changes.dueAt).toISOString() : assignment.dueAt,
    attemptLimit: changes.attemptLimit === undefined ? assignment.attemptLimit : changes.attemptLimit,
    hintsAllowed: changes.hintsAllowed ?? Boolean(assignment.hintsAllowed),
    scorePolicy: changes.scorePolicy ?? assignment.scorePolicy,
  }
  if (next.dueAt <= next.opensAt) {
    throw new HttpError(400, 'validation_failed', 'The due date must be after the opening date', {
      fields: { dueAt: ['Must be after the opening date'] },
    })
  }
  const { id: _id, ...fields } = next
  await ctx.dataSource.getRepository(AssignmentEntity).update({ id: assignment.id }, fields)
  return presentOne(ctx, next, user)
}

/** Only an assignment nobody has attempted may go; otherwise its dates are what to change. */
export async function deleteAssignment(ctx: AppContext, user: UserRow, assignmentId: string): Promise<void> {
  const ds = ctx.dataSource
  const { assignment } = await assignmentFor(ds, user, assignmentId, 'manage')
  if (await ds.getRepository(AttemptEntity).countBy({ assignmentId: assignment.id })) {
    throw conflict(
      'conflict',
      'This assignment already has attempts; change its dates instead of deleting it',
    )
  }
  await ds.getRepository(AssignmentEntity).delete({ id: assignment.id })
}

export async function assignmentStats(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
): Promise<AssignmentStats> {
  const ds = ctx.dataSource
  const { assignment } = await assignmentFor(ds, user, assignmentId, 'manage')
  const members = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: assignment.cohortId })
  const byMember = await standingsByAssignmentAndUser(ds, [assignment.id])
  const standings = members.map((m) => byMember.get(`${assignment.id}:${m.userId}`) ?? NOT_STARTED)
  return presentAssignmentStats(assignment.id, standings)
}
