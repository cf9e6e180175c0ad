// Attempts as people read and review them: lists and detail as each role may see them, instructor feedback
// and audited grade overrides. Submission is in submission.service.ts.
import { randomUUID } from 'node:crypto'
import { In, type EntityManager, type FindOptionsWhere } from 'typeorm'
import type { z } from 'zod'
import type {
  AttemptDetail,
  AttemptOverview,
  AttemptPage,
  AttemptSummary,
  Feedback,
  GradeAuditEntry,
  GradeOverrideRequest,
  attemptListQuerySchema,
} from '@shared/api/attempts'
import { assignmentFor, attemptFor, taughtCohortIds } from '../access/access.service'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  AuditEntryEntity,
  FeedbackEntity,
  ScenarioEntity,
  UserEntity,
  type AttemptRow,
  type AuditEntryRow,
  type FeedbackRow,
  type UserRow,
} from '../entities'
import { conflict, forbidden } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { queueMail } from '../infrastructure/mail/mail-job'
import { queueScorePost } from '../lti/score-post-job'
import { attemptReviewedMail } from '../infrastructure/mail/templates'
import {
  presentAttemptDetail,
  presentAttemptOverview,
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
  reviewedAt: true,
  reviewedById: true,
  overriddenAt: true,
  overrideReason: true,
  assistanceLevel: true,
} satisfies Record<keyof AttemptSummaryRow, true>

/** Summaries with their apprentices' names and scenario keys and titles, read in two queries. */
async function presentAttempts(ctx: AppContext, rows: AttemptSummaryRow[]): Promise<AttemptSummary[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const users = await ds.getRepository(UserEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.userId))]) },
    select: { id: true, name: true },
  })
  const scenarios = await ds.getRepository(ScenarioEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.scenarioId))]) },
    select: { id: true, key: true, version: true, title: true },
  })
  return rows.map((row) =>
    presentAttemptSummary(row, {
      userName: users.find((u) => u.id === row.userId)?.name ?? '',
      scenario: scenarios.find((s) => s.id === row.scenarioId)!,
    }),
  )
}

/** One attempt as a summary (the submission answer, the head of the detail). */
export const presentOne = async (ctx: AppContext, row: AttemptSummaryRow) =>
  (await presentAttempts(ctx, [row]))[0]!

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

/** A page of attempts: apprentices see their own, instructors those on their cohorts' assignments. */
export async function listAttempts(
  ctx: AppContext,
  user: UserRow,
  q: AttemptListQuery,
): Promise<AttemptPage> {
  const ds = ctx.dataSource
  const where: FindOptionsWhere<AttemptRow> = {
    ...(q.status ? { status: q.status } : {}),
    ...(q.scenarioId ? { scenarioId: q.scenarioId } : {}),
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
    const cohortIds = await taughtCohortIds(ds, user.id)
    const assignments = cohortIds.length
      ? await ds.getRepository(AssignmentEntity).findBy({ cohortId: In(cohortIds) })
      : []
    where.assignmentId = In(assignments.map((a) => a.id))
  }
  // Counted apart: TypeORM 1.1's findAndCount with a `select` counts 0 once a page is full.
  const repository = ds.getRepository(AttemptEntity)
  const [rows, total] = await Promise.all([
    repository.find({
      where,
      select: ATTEMPT_SUMMARY_SELECT,
      order: { updatedAt: 'DESC' },
      skip: (q.page - 1) * q.pageSize,
      take: q.pageSize,
    }),
    repository.count({ where }),
  ])
  return { items: await presentAttempts(ctx, rows), total, page: q.page, pageSize: q.pageSize }
}

/** One attempt with its event log (for replay), feedback and grade history. */
export async function getAttemptDetail(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<AttemptDetail> {
  const attempt = await attemptFor(ctx.dataSource, user, attemptId, 'read')
  return presentAttemptDetail(await overviewOf(ctx, attempt), attempt)
}

/** The same without the event log (which can run to megabytes): for result and review pages. */
export async function getAttemptOverview(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<AttemptOverview> {
  const attempt = await attemptFor(ctx.dataSource, user, attemptId, 'read')
  return overviewOf(ctx, attempt)
}

async function overviewOf(ctx: AppContext, attempt: AttemptRow): Promise<AttemptOverview> {
  const ds = ctx.dataSource
  const summary = await presentOne(ctx, attempt)
  const feedback = await ds
    .getRepository(FeedbackEntity)
    .find({ where: { attemptId: attempt.id }, order: { createdAt: 'ASC' } })
  // The grade's own trail: the attempt's other audit entries (a live fault put in, a hint) are not grades.
  const audit = await ds.getRepository(AuditEntryEntity).find({
    where: { entityType: 'attempt', entityId: attempt.id, action: In(['grade.graded', 'grade.overridden']) },
    order: { createdAt: 'ASC' },
  })
  return presentAttemptOverview(
    summary,
    await presentFeedbackRows(ctx, feedback),
    await presentAuditRows(ctx, audit),
  )
}

/** Tells the attempt's owner (if still active) that their attempt was reviewed, in the review's transaction. */
async function notifyOwner(
  ctx: AppContext,
  manager: EntityManager,
  attempt: AttemptRow,
  what: 'overridden' | 'feedback',
  score?: number,
  passed?: boolean,
) {
  const owner = await manager.getRepository(UserEntity).findOneBy({ id: attempt.userId })
  const assignment = attempt.assignmentId
    ? await manager.getRepository(AssignmentEntity).findOneBy({ id: attempt.assignmentId })
    : null
  if (!owner?.active) return
  await queueMail(
    manager,
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
  await ctx.dataSource.transaction(async (manager) => {
    await manager.getRepository(FeedbackEntity).insert(row)
    // Feedback is a review; the apprentice's own activity time stays as it was.
    if (!attempt.reviewedAt) {
      await manager
        .getRepository(AttemptEntity)
        .update({ id: attempt.id }, { reviewedAt: row.createdAt, reviewedById: user.id })
    }
    await notifyOwner(ctx, manager, attempt, 'feedback')
  })
  return (await presentFeedbackRows(ctx, [row]))[0]!
}

/** Marks a submitted attempt reviewed (or awaiting review again); the needs-attention list follows it. */
export async function markReviewed(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  reviewed: boolean,
): Promise<AttemptSummary> {
  const ds = ctx.dataSource
  const attempt = await attemptFor(ds, user, attemptId, 'manage')
  if (attempt.status !== 'submitted') throw conflict('conflict', 'Only a submitted attempt can be reviewed')
  await ds
    .getRepository(AttemptEntity)
    .update(
      { id: attempt.id },
      reviewed ? { reviewedAt: nowIso(), reviewedById: user.id } : { reviewedAt: null, reviewedById: null },
    )
  return presentOne(ctx, await ds.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.id }))
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
    // Not updatedAt: that is the apprentice's last activity, and the instructor's change is not theirs.
    await manager.getRepository(AttemptEntity).update(
      { id: attempt.id },
      {
        score,
        passed,
        overriddenAt: now,
        overrideReason: reason,
        reviewedAt: attempt.reviewedAt ?? now,
        reviewedById: attempt.reviewedById ?? user.id,
      },
    )
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
    await notifyOwner(ctx, manager, attempt, 'overridden', score, passed)
    if (attempt.assignmentId) {
      await queueScorePost(manager, { assignmentId: attempt.assignmentId, userId: attempt.userId })
    }
  })
  return presentOne(ctx, await ds.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.id }))
}
