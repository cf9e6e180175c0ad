// Attempts: submission (validate the target and the rules, grade on the server, store once, idempotent by
// id), lists and detail as each role may see them, instructor feedback and audited grade overrides.
import { randomUUID } from 'node:crypto'
import { In, type FindOptionsWhere } from 'typeorm'
import type { z } from 'zod'
import type {
  AttemptDetail,
  AttemptPage,
  AttemptSummary,
  Feedback,
  GradeAuditEntry,
  GradeOverrideRequest,
  SubmitAttemptRequest,
  attemptListQuerySchema,
} from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model/events'
import { assignmentFor, attemptFor, isEnrolled } from '../access/access.service'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  AuditEntryEntity,
  CohortEntity,
  FeedbackEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type AttemptRow,
  type AuditEntryRow,
  type FeedbackRow,
  type ScenarioRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict, forbidden } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { attemptReviewedMail } from '../infrastructure/mail/templates'
import {
  presentAttemptDetail,
  presentAttemptSummary,
  presentAuditEntry,
  presentFeedback,
  type AttemptSummaryRow,
} from './attempt.presenter'

type AttemptListQuery = z.output<typeof attemptListQuerySchema>

/** TypeORM `select` for list routes: every column but the event log, which can run to megabytes. */
export const ATTEMPT_SUMMARY_SELECT = {
  id: true,
  userId: true,
  assignmentId: true,
  scenarioId: true,
  status: true,
  eventCount: true,
  late: true,
  startedAt: true,
  updatedAt: true,
  submittedAt: true,
  autoScore: true,
  autoPassed: true,
  score: true,
  passed: true,
  evidence: true,
  gradedAt: true,
} satisfies Record<keyof AttemptSummaryRow, true>

/** Summaries with their apprentices' names and scenario keys, read in two queries. */
async function presentAttempts(ctx: AppContext, rows: AttemptSummaryRow[]): Promise<AttemptSummary[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const users = await ds.getRepository(UserEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.userId))]) },
    select: { id: true, name: true },
  })
  const scenarios = await ds.getRepository(ScenarioEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.scenarioId))]) },
    select: { id: true, key: true, version: true },
  })
  return rows.map((row) =>
    presentAttemptSummary(row, {
      userName: users.find((u) => u.id === row.userId)?.name ?? '',
      scenario: scenarios.find((s) => s.id === row.scenarioId)!,
    }),
  )
}

const presentOne = async (ctx: AppContext, row: AttemptSummaryRow) => (await presentAttempts(ctx, [row]))[0]!

async function presentFeedbackRows(ctx: AppContext, rows: FeedbackRow[]): Promise<Feedback[]> {
  const authors = rows.length
    ? await ctx.dataSource
        .getRepository(UserEntity)
        .findBy({ id: In([...new Set(rows.map((r) => r.authorId))]) })
    : []
  return rows.map((row) => presentFeedback(row, authors.find((a) => a.id === row.authorId)?.name ?? ''))
}

async function presentAuditRows(ctx: AppContext, rows: AuditEntryRow[]): Promise<GradeAuditEntry[]> {
  const actorIds = rows.map((r) => r.actorId).filter((id): id is string => id !== null)
  const actors = actorIds.length
    ? await ctx.dataSource.getRepository(UserEntity).findBy({ id: In(actorIds) })
    : []
  return rows.map((row) =>
    presentAuditEntry(row, row.actorId ? (actors.find((a) => a.id === row.actorId)?.name ?? '') : null),
  )
}

interface Target {
  scenario: ScenarioRow
  assignment: AssignmentRow | null
}

async function resolveTarget(ctx: AppContext, user: UserRow, body: SubmitAttemptRequest): Promise<Target> {
  const ds = ctx.dataSource
  if (body.assignmentId) {
    const assignment = await findById(ds, AssignmentEntity, body.assignmentId)
    if (!assignment) throw new HttpError(404, 'not_found', 'Assignment not found')
    if (!(await isEnrolled(ds, assignment.cohortId, user.id))) {
      throw new HttpError(403, 'forbidden', 'This assignment is not set for you')
    }
    const cohort = await findById(ds, CohortEntity, assignment.cohortId)
    if (cohort?.archived)
      throw conflict('cohort_archived', 'This cohort is archived; its assignments are closed')
    const scenario = await findById(ds, ScenarioEntity, assignment.scenarioId)
    if (!scenario) throw new Error(`assignment ${assignment.id} names a missing scenario version`)
    return { scenario, assignment }
  }
  const scenario = await findById(ds, ScenarioEntity, body.scenarioId!)
  if (!scenario) {
    throw new HttpError(400, 'validation_failed', 'No such scenario version', {
      fields: { scenarioId: ['No such scenario version'] },
    })
  }
  if (scenario.status === 'retired') throw conflict('scenario_retired', 'This scenario is retired')
  return { scenario, assignment: null }
}

function checkRules(assignment: AssignmentRow, events: AttemptEvent[], usedAttempts: number, now: string) {
  if (now < assignment.opensAt) {
    throw conflict('assignment_not_open', `This assignment opens at ${assignment.opensAt}`)
  }
  if (assignment.attemptLimit !== null && usedAttempts >= assignment.attemptLimit) {
    throw conflict(
      'attempt_limit_reached',
      `All ${assignment.attemptLimit} attempt(s) allowed have been used`,
    )
  }
  if (!assignment.hintsAllowed && events.some((e) => e.type === 'hint.revealed')) {
    throw new HttpError(400, 'hints_not_allowed', 'Hints are not allowed on this assignment', {
      fields: { events: ['Contains a revealed hint'] },
    })
  }
}

class LostRace extends Error {}

export interface SubmitResult {
  /** False when the same id was already stored: the answer is then the stored result (200, not 201). */
  created: boolean
  attempt: AttemptSummary
}

export async function submitAttempt(
  ctx: AppContext,
  user: UserRow,
  body: SubmitAttemptRequest,
): Promise<SubmitResult> {
  const { created, attempt } = await storeSubmission(ctx, user, body)
  return { created, attempt: await presentOne(ctx, attempt) }
}

async function storeSubmission(
  ctx: AppContext,
  user: UserRow,
  body: SubmitAttemptRequest,
): Promise<{ created: boolean; attempt: AttemptRow }> {
  const ds = ctx.dataSource
  const attempts = ds.getRepository(AttemptEntity)
  const existing = await findById(ds, AttemptEntity, body.id)
  if (existing) {
    if (existing.userId !== user.id) throw conflict('attempt_conflict', 'This attempt id is already in use')
    // A repeated submission: hand back what was stored, change nothing.
    if (existing.status === 'submitted') return { created: false, attempt: existing }
    const sameTarget = body.assignmentId
      ? existing.assignmentId === body.assignmentId
      : existing.assignmentId === null && existing.scenarioId === body.scenarioId
    if (!sameTarget)
      throw conflict('attempt_conflict', 'This attempt belongs to a different assignment or scenario')
  }
  const { scenario, assignment } = await resolveTarget(ctx, user, body)
  const now = nowIso()
  const events = body.events as AttemptEvent[]
  if (assignment) {
    const used = await attempts.countBy({ assignmentId: assignment.id, userId: user.id, status: 'submitted' })
    checkRules(assignment, events, used, now)
  }
  const submitting = body.status === 'submitted'
  // Serialised once: the row stores this text, and a grading thread parses it (cheaper than cloning
  // thousands of event objects across the thread boundary).
  const eventsJson = JSON.stringify(events)
  const grade = submitting ? await ctx.grading.grade(scenario, { events, json: eventsJson }) : null
  const row: AttemptRow = {
    id: body.id,
    userId: user.id,
    assignmentId: assignment?.id ?? null,
    scenarioId: scenario.id,
    status: body.status,
    events: eventsJson,
    eventCount: events.length,
    late: Boolean(assignment && submitting && now > assignment.dueAt),
    startedAt: existing?.startedAt ?? now,
    updatedAt: now,
    submittedAt: submitting ? now : null,
    autoScore: grade?.score ?? null,
    autoPassed: grade?.passed ?? null,
    score: grade?.score ?? null,
    passed: grade?.passed ?? null,
    evidence: grade ? JSON.stringify(grade.evidence) : null,
    gradedAt: grade ? now : null,
  }
  try {
    await ds.transaction(async (manager) => {
      if (existing) {
        // Only a draft may change; if a racing request submitted it meanwhile, that one wins.
        const changed = await manager
          .getRepository(AttemptEntity)
          .update({ id: row.id, status: 'inProgress' }, row)
        if (!changed.affected) throw new LostRace()
      } else {
        await manager.getRepository(AttemptEntity).insert(row)
      }
      if (grade) {
        await manager.getRepository(AuditEntryEntity).insert({
          id: randomUUID(),
          actorId: null,
          action: 'grade.graded',
          entityType: 'attempt',
          entityId: row.id,
          fromValue: null,
          toValue: JSON.stringify({ score: grade.score, passed: grade.passed }),
          reason: 'Graded by replaying the event log',
          createdAt: now,
        })
      }
    })
  } catch (error) {
    // Two identical submissions racing: the loser returns the winner's stored result.
    const winner = await attempts.findOneBy({ id: body.id })
    if (winner?.userId === user.id && (error instanceof LostRace || !existing))
      return { created: false, attempt: winner }
    throw error
  }
  if (grade && assignment) {
    ctx.mailer.send(
      attemptReviewedMail({
        to: user.email,
        name: user.name,
        title: assignment.title,
        what: 'graded',
        score: Math.round(grade.score),
        passed: grade.passed,
        url: appLink(ctx, `/attempts/${row.id}`),
      }),
    )
  }
  return { created: !existing || submitting, attempt: row }
}

/** A page of attempts: apprentices see their own, instructors those on their cohorts' assignments. */
export async function listAttempts(
  ctx: AppContext,
  user: UserRow,
  q: AttemptListQuery,
): Promise<AttemptPage> {
  const ds = ctx.dataSource
  const where: FindOptionsWhere<AttemptRow> = {
    ...(q.status ? { status: q.status } : {}),
    ...(q.userId ? { userId: q.userId } : {}),
  }
  if (q.assignmentId) {
    await assignmentFor(ds, user, q.assignmentId, 'read')
    where.assignmentId = q.assignmentId
  }
  if (user.role === 'apprentice') {
    if (q.userId && q.userId !== user.id) throw forbidden('You can only list your own attempts')
    where.userId = user.id
  } else if (user.role === 'instructor' && !q.assignmentId) {
    const cohorts = await ds.getRepository(CohortEntity).findBy({ ownerId: user.id })
    const assignments = cohorts.length
      ? await ds.getRepository(AssignmentEntity).findBy({ cohortId: In(cohorts.map((c) => c.id)) })
      : []
    where.assignmentId = In(assignments.map((a) => a.id))
  }
  const [rows, total] = await ds.getRepository(AttemptEntity).findAndCount({
    where,
    select: ATTEMPT_SUMMARY_SELECT,
    order: { updatedAt: 'DESC' },
    skip: (q.page - 1) * q.pageSize,
    take: q.pageSize,
  })
  return { items: await presentAttempts(ctx, rows), total, page: q.page, pageSize: q.pageSize }
}

/** One attempt with its event log (for replay), feedback and grade history. */
export async function getAttemptDetail(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<AttemptDetail> {
  const ds = ctx.dataSource
  const attempt = await attemptFor(ds, user, attemptId, 'read')
  const summary = await presentOne(ctx, attempt)
  const feedback = await ds
    .getRepository(FeedbackEntity)
    .find({ where: { attemptId: attempt.id }, order: { createdAt: 'ASC' } })
  const audit = await ds.getRepository(AuditEntryEntity).find({
    where: { entityType: 'attempt', entityId: attempt.id },
    order: { createdAt: 'ASC' },
  })
  return presentAttemptDetail(
    summary,
    attempt,
    await presentFeedbackRows(ctx, feedback),
    await presentAuditRows(ctx, audit),
  )
}

/** Tells the attempt's owner (if still active) that their attempt was reviewed. */
async function notifyOwner(
  ctx: AppContext,
  attempt: AttemptRow,
  what: 'overridden' | 'feedback',
  score?: number,
  passed?: boolean,
) {
  const ds = ctx.dataSource
  const owner = await ds.getRepository(UserEntity).findOneBy({ id: attempt.userId })
  const assignment = attempt.assignmentId
    ? await ds.getRepository(AssignmentEntity).findOneBy({ id: attempt.assignmentId })
    : null
  if (!owner?.active) return
  ctx.mailer.send(
    attemptReviewedMail({
      to: owner.email,
      name: owner.name,
      title: assignment?.title ?? 'your practice attempt',
      what,
      score,
      passed,
      url: appLink(ctx, `/attempts/${attempt.id}`),
    }),
  )
}

export async function addFeedback(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  body: string,
): Promise<Feedback> {
  const attempt = await attemptFor(ctx.dataSource, user, attemptId, 'manage')
  const row: FeedbackRow = {
    id: randomUUID(),
    attemptId: attempt.id,
    authorId: user.id,
    body,
    createdAt: nowIso(),
  }
  await ctx.dataSource.getRepository(FeedbackEntity).insert(row)
  await notifyOwner(ctx, attempt, 'feedback')
  return (await presentFeedbackRows(ctx, [row]))[0]!
}

/** An instructor's grade replaces the grader's as the one that counts; the change is audited with its reason. */
export async function overrideGrade(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  { score, passed, reason }: GradeOverrideRequest,
): Promise<AttemptSummary> {
  const ds = ctx.dataSource
  const attempt = await attemptFor(ds, user, attemptId, 'manage')
  if (attempt.status !== 'submitted' || attempt.score === null) {
    throw conflict('conflict', 'Only a submitted, graded attempt can have its grade changed')
  }
  const now = nowIso()
  await ds.transaction(async (manager) => {
    await manager.getRepository(AttemptEntity).update({ id: attempt.id }, { score, passed, updatedAt: now })
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: user.id,
      action: 'grade.overridden',
      entityType: 'attempt',
      entityId: attempt.id,
      fromValue: JSON.stringify({ score: attempt.score, passed: Boolean(attempt.passed) }),
      toValue: JSON.stringify({ score, passed }),
      reason,
      createdAt: now,
    })
  })
  await notifyOwner(ctx, attempt, 'overridden', score, passed)
  return presentOne(ctx, await ds.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.id }))
}
