// Assignments: set in a cohort by its instructor (publishing mails every member), seen by its apprentices
// with their own standing; statistics for staff.
import { randomUUID } from 'node:crypto'
import { In, type DataSource, type EntityManager } from 'typeorm'
import type {
  Assignment,
  AssignmentStats,
  CreateAssignment,
  UpdateAssignmentRequest,
} from '@shared/api/assignments'
import { requestedAssistanceLevel } from '@shared/api/assignments'
import { DEFAULT_ASSISTANCE_LEVEL, type AssistanceLevel } from '@shared/scenario/assistance'
import { assignmentFor, cohortFor, readableCohortIds } from '../access/access.service'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AssignmentRecipientEntity,
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type UserRow,
} from '../entities'
import { centreTimeZone } from '../centre/centre.service'
import { standingsFor, pairKey } from '../gradebook/standings'
import { HttpError, conflict, forbidden } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { queueMail } from '../infrastructure/mail/mail-job'
import { assignmentPublishedMail } from '../infrastructure/mail/templates'
import { passRulesOf, UNKNOWN_RULE } from '../scenarios/pass-rules'
import { presentAssignment, presentAssignmentStats } from './assignment.presenter'
import { refreshLateFlags } from './late-flags'

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
    select: { id: true, key: true, version: true, title: true },
  })
  const mine =
    viewer.role === 'apprentice' ? await standingsFor(ds, rows, [viewer.id], nowIso(), viewer.id) : undefined
  return rows.map((row) =>
    presentAssignment(row, {
      cohortName: cohorts.find((c) => c.id === row.cohortId)?.name ?? '',
      scenario: scenarios.find((s) => s.id === row.scenarioId)!,
      mine: mine?.get(pairKey(row.id, viewer.id)),
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
  const presented = await presentAssignments(ctx, rows, user)
  // An apprentice sees only the work set for them.
  return user.role === 'apprentice'
    ? presented.filter((a) => a.myProgress?.status !== 'notAssigned')
    : presented
}

/** The apprentices named, all of them members of the cohort (else a field error names who is not). */
function checkAudience(members: string[], apprenticeIds: string[]): string[] {
  const outsiders = apprenticeIds.filter((id) => !members.includes(id))
  if (outsiders.length) {
    throw new HttpError(400, 'validation_failed', 'Set work only for members of the cohort', {
      fields: { apprenticeIds: [`${outsiders.length} of those named are not members of this cohort`] },
    })
  }
  return [...new Set(apprenticeIds)]
}

/** Replaces who a selected-audience assignment is for (none kept for a whole-cohort one). */
async function setRecipients(manager: EntityManager, assignment: AssignmentRow, userIds: string[]) {
  const repo = manager.getRepository(AssignmentRecipientEntity)
  await repo.delete({ assignmentId: assignment.id })
  if (assignment.audience !== 'selected' || !userIds.length) return
  const now = nowIso()
  await repo.insert(
    userIds.map((userId) => ({ id: randomUUID(), assignmentId: assignment.id, userId, createdAt: now })),
  )
}

/** Mails each active apprentice named that the work is set for them. */
async function tellApprentices(
  ctx: AppContext,
  manager: EntityManager,
  row: AssignmentRow,
  cohortName: string,
  userIds: string[],
) {
  const people = userIds.length
    ? await manager.getRepository(UserEntity).findBy({ id: In(userIds), active: true })
    : []
  const timeZone = await centreTimeZone(manager)
  for (const person of people) {
    await queueMail(
      manager,
      assignmentPublishedMail({
        to: person.email,
        name: person.name,
        title: row.title,
        cohortName,
        dueAt: row.dueAt,
        timeZone,
        url: appLink(ctx, `/assignments/${row.id}`),
      }),
    )
  }
}

/** Who an assignment is set for now: its recipients, or every member of the cohort. */
async function audienceOf(ds: DataSource, row: AssignmentRow, members: string[]): Promise<string[]> {
  if (row.audience !== 'selected') return members
  return (await ds.getRepository(AssignmentRecipientEntity).findBy({ assignmentId: row.id })).map(
    (r) => r.userId,
  )
}

/** Publishing tells every active apprentice it is set for by mail. */
/** The level and the older hints column, kept in step: hints everywhere but in an assessment. */
function assistanceColumns(level: AssistanceLevel): Pick<AssignmentRow, 'assistanceLevel' | 'hintsAllowed'> {
  return { assistanceLevel: level, hintsAllowed: level !== 'assessment' }
}

export async function createAssignment(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  body: CreateAssignment,
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
    ...assistanceColumns(requestedAssistanceLevel(body) ?? DEFAULT_ASSISTANCE_LEVEL),
    scorePolicy: body.scorePolicy,
    createdById: user.id,
    createdAt: nowIso(),
    latePolicy: body.latePolicy,
    latePenalty: body.latePolicy === 'acceptLate' ? body.latePenalty : 0,
    audience: body.apprenticeIds ? 'selected' : 'cohort',
  }
  const members = (await ds.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })).map(
    (m) => m.userId,
  )
  const audience = body.apprenticeIds ? checkAudience(members, body.apprenticeIds) : members
  await ds.transaction(async (manager) => {
    await manager.getRepository(AssignmentEntity).insert(row)
    if (body.apprenticeIds) await setRecipients(manager, row, audience)
    // Mail is queued with the change: a failed insert sends nothing.
    await tellApprentices(ctx, manager, row, cohort.name, audience)
  })
  return presentOne(ctx, row, user)
}

export async function getAssignment(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
): Promise<Assignment> {
  const { assignment } = await assignmentFor(ctx.dataSource, user, assignmentId, 'read')
  const presented = await presentOne(ctx, assignment, user)
  if (presented.myProgress?.status === 'notAssigned') throw forbidden('This assignment is not set for you')
  return presented
}

export async function updateAssignment(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
  changes: UpdateAssignmentRequest,
): Promise<Assignment> {
  const { assignment, cohort } = await assignmentFor(ctx.dataSource, user, assignmentId, 'manage')
  const next: AssignmentRow = {
    ...assignment,
    title: changes.title || assignment.title,
    opensAt: changes.opensAt ? new Date(changes.opensAt).toISOString() : assignment.opensAt,
    dueAt: changes.dueAt ? new Date(changes.dueAt).toISOString() : assignment.dueAt,
    attemptLimit: changes.attemptLimit === undefined ? assignment.attemptLimit : changes.attemptLimit,
    ...assistanceColumns(requestedAssistanceLevel(changes) ?? assignment.assistanceLevel),
    scorePolicy: changes.scorePolicy ?? assignment.scorePolicy,
    latePolicy: changes.latePolicy ?? assignment.latePolicy,
    latePenalty: changes.latePenalty ?? assignment.latePenalty,
    audience:
      changes.apprenticeIds === undefined
        ? assignment.audience
        : changes.apprenticeIds === null
          ? 'cohort'
          : 'selected',
  }
  if (next.latePolicy === 'closeAtDue') next.latePenalty = 0
  if (next.dueAt <= next.opensAt) {
    throw new HttpError(400, 'validation_failed', 'The due date must be after the opening date', {
      fields: { dueAt: ['Must be after the opening date'] },
    })
  }
  const { id: _id, ...fields } = next
  const members = (await ctx.dataSource.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })).map(
    (m) => m.userId,
  )
  const before = await audienceOf(ctx.dataSource, assignment, members)
  const audience = changes.apprenticeIds ? checkAudience(members, changes.apprenticeIds) : members
  await ctx.dataSource.transaction(async (manager) => {
    await manager.getRepository(AssignmentEntity).update({ id: assignment.id }, fields)
    if (changes.apprenticeIds !== undefined) await setRecipients(manager, next, audience)
    // A moved due date decides again which attempts were late.
    if (next.dueAt !== assignment.dueAt) await refreshLateFlags(manager, next)
    // Those it is newly set for hear of it as the first ones did.
    if (changes.apprenticeIds !== undefined) {
      const added = audience.filter((id) => !before.includes(id))
      await tellApprentices(ctx, manager, next, cohort.name, added)
    }
  })
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
  const userIds = members.map((m) => m.userId)
  const byMember = await standingsFor(ds, [assignment], userIds, nowIso())
  const rule = (await passRulesOf(ds, [assignment.scenarioId])).get(assignment.scenarioId) ?? UNKNOWN_RULE
  return presentAssignmentStats(
    assignment.id,
    userIds.map((id) => byMember.get(pairKey(assignment.id, id))!),
    rule,
  )
}
