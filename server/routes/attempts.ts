// /api/attempts: submit or save progress, list and read (with replay log), feedback and grade overrides.
import { randomUUID } from 'node:crypto'
import { Router } from 'express'
import { In, type FindOptionsWhere } from 'typeorm'
import { idParamsSchema } from '@shared/api/common'
import {
  attemptListQuerySchema,
  feedbackRequestSchema,
  gradeOverrideRequestSchema,
  submitAttemptRequestSchema,
  type AttemptStatus,
  type FeedbackRequest,
  type GradeOverrideRequest,
  type SubmitAttemptRequest,
} from '@shared/api/attempts'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  AuditEntryEntity,
  CohortEntity,
  FeedbackEntity,
  UserEntity,
  type AttemptRow,
  type FeedbackRow,
} from '../entities'
import { conflict, forbidden } from '../http-error'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { assignmentFor, attemptFor } from '../services/access'
import { ATTEMPT_SUMMARY_SELECT, presentAttempts, presentAudit, submitAttempt } from '../services/attempts'
import { nowIso } from '../services/clock'
import { attemptReviewedMail } from '../services/mail-templates'

export function attemptsRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  const staff = requireRole('instructor', 'admin')
  router.use(authenticate(ctx))

  router.post('/', validate({ body: submitAttemptRequestSchema }), async (req, res) => {
    const { created, attempt } = await submitAttempt(ctx, currentUser(req), req.body as SubmitAttemptRequest)
    res.status(created ? 201 : 200).json((await presentAttempts(ctx, [attempt]))[0])
  })

  router.get('/', validate({ query: attemptListQuerySchema }), async (req, res) => {
    const user = currentUser(req)
    const q = req.query as unknown as {
      page: number
      pageSize: number
      assignmentId?: string
      scenarioId?: string
      userId?: string
      status?: AttemptStatus
    }
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
      const cohorts = await ds.getRepository(CohortEntity).findBy({ ownerId: user.id })
      const assignments = cohorts.length
        ? await ds.getRepository(AssignmentEntity).findBy({ cohortId: In(cohorts.map((c) => c.id)) })
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
    res.json({ items: await presentAttempts(ctx, rows), total, page: q.page, pageSize: q.pageSize })
  })

  async function presentFeedback(rows: FeedbackRow[]) {
    const authors = rows.length
      ? await ds.getRepository(UserEntity).findBy({ id: In([...new Set(rows.map((r) => r.authorId))]) })
      : []
    return rows.map((row) => ({ ...row, authorName: authors.find((a) => a.id === row.authorId)?.name ?? '' }))
  }

  async function presentOverview(attempt: AttemptRow) {
    const [summary] = await presentAttempts(ctx, [attempt])
    const feedback = await ds
      .getRepository(FeedbackEntity)
      .find({ where: { attemptId: attempt.id }, order: { createdAt: 'ASC' } })
    const audit = await ds.getRepository(AuditEntryEntity).find({
      where: { entityType: 'attempt', entityId: attempt.id },
      order: { createdAt: 'ASC' },
    })
    return { ...summary, feedback: await presentFeedback(feedback), audit: await presentAudit(ctx, audit) }
  }

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    const attempt = await attemptFor(ds, currentUser(req), String(req.params.id), 'read')
    res.json({ ...(await presentOverview(attempt)), events: JSON.parse(attempt.events) })
  })

  // The same without the event log (which can run to megabytes): for result and review pages.
  router.get('/:id/overview', validate({ params: idParamsSchema }), async (req, res) => {
    const attempt = await attemptFor(ds, currentUser(req), String(req.params.id), 'read')
    res.json(await presentOverview(attempt))
  })

  async function notifyOwner(
    attempt: AttemptRow,
    what: 'overridden' | 'feedback',
    score?: number,
    passed?: boolean,
  ) {
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

  router.post(
    '/:id/feedback',
    staff,
    validate({ params: idParamsSchema, body: feedbackRequestSchema }),
    async (req, res) => {
      const user = currentUser(req)
      const attempt = await attemptFor(ds, user, String(req.params.id), 'manage')
      const row: FeedbackRow = {
        id: randomUUID(),
        attemptId: attempt.id,
        authorId: user.id,
        body: (req.body as FeedbackRequest).body,
        createdAt: nowIso(),
      }
      await ds.getRepository(FeedbackEntity).insert(row)
      await notifyOwner(attempt, 'feedback')
      res.status(201).json((await presentFeedback([row]))[0])
    },
  )

  router.post(
    '/:id/grade-override',
    staff,
    validate({ params: idParamsSchema, body: gradeOverrideRequestSchema }),
    async (req, res) => {
      const user = currentUser(req)
      const attempt = await attemptFor(ds, user, String(req.params.id), 'manage')
      if (attempt.status !== 'submitted' || attempt.score === null) {
        throw conflict('conflict', 'Only a submitted, graded attempt can have its grade changed')
      }
      const { score, passed, reason } = req.body as GradeOverrideRequest
      const now = nowIso()
      await ds.transaction(async (manager) => {
        await manager
          .getRepository(AttemptEntity)
          .update({ id: attempt.id }, { score, passed, updatedAt: now })
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
      await notifyOwner(attempt, 'overridden', score, passed)
      const updated = await ds.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.id })
      res.json((await presentAttempts(ctx, [updated]))[0])
    },
  )

  return router
}
