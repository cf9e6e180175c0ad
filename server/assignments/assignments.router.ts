// Assignments (mounted at /api): set in a cohort by its instructor, seen by its apprentices; statistics for staff.
import { randomUUID } from 'node:crypto'
import { Router } from 'express'
import { In } from 'typeorm'
import { idParamsSchema } from '@shared/api/common'
import {
  assignmentListQuerySchema,
  createAssignmentRequestSchema,
  updateAssignmentRequestSchema,
  type Assignment,
  type AssignmentListQuery,
  type CreateAssignmentRequest,
  type UpdateAssignmentRequest,
} from '@shared/api/assignments'
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
import { HttpError, conflict } from '../http-error'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { assignmentFor, cohortFor, readableCohortIds } from '../access/access.service'
import { nowIso } from '../infrastructure/clock'
import { assignmentPublishedMail } from '../infrastructure/mail/templates'
import { NOT_STARTED, standingsByAssignmentAndUser } from '../gradebook/standings'
import { histogram, mean, median } from './stats'

export function assignmentsRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  const auth = authenticate(ctx)
  const staff = requireRole('instructor', 'admin')

  async function present(rows: AssignmentRow[], viewer: UserRow): Promise<Assignment[]> {
    if (rows.length === 0) return []
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
    return rows.map((row) => {
      const scenario = scenarios.find((s) => s.id === row.scenarioId)!
      const standing = mine ? (mine.get(`${row.id}:${viewer.id}`) ?? NOT_STARTED) : undefined
      return {
        id: row.id,
        cohortId: row.cohortId,
        cohortName: cohorts.find((c) => c.id === row.cohortId)?.name ?? '',
        scenarioId: row.scenarioId,
        scenarioKey: scenario.key,
        scenarioVersion: scenario.version,
        title: row.title,
        opensAt: row.opensAt,
        dueAt: row.dueAt,
        attemptLimit: row.attemptLimit,
        hintsAllowed: Boolean(row.hintsAllowed),
        createdAt: row.createdAt,
        myProgress: standing
          ? {
              attemptsUsed: standing.attempts,
              bestScore: standing.bestScore,
              passed: standing.passed,
              inProgressAttemptId: standing.inProgressAttemptId,
            }
          : null,
      }
    })
  }

  router.get('/assignments', auth, validate({ query: assignmentListQuerySchema }), async (req, res) => {
    const user = currentUser(req)
    const { cohortId } = req.query as AssignmentListQuery
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
    res.json({ items: await present(rows, user) })
  })

  router.post(
    '/cohorts/:id/assignments',
    auth,
    staff,
    validate({ params: idParamsSchema, body: createAssignmentRequestSchema }),
    async (req, res) => {
      const user = currentUser(req)
      const cohort = await cohortFor(ds, user, String(req.params.id), 'manage')
      if (cohort.archived) throw new HttpError(409, 'cohort_archived', 'This cohort is archived')
      const body = req.body as CreateAssignmentRequest
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
        createdById: user.id,
        createdAt: nowIso(),
      }
      await ds.getRepository(AssignmentEntity).insert(row)
      // Publishing tells every member of the cohort.
      const members = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
      const people = members.length
        ? await ds.getRepository(UserEntity).findBy({ id: In(members.map((m) => m.userId)), active: true })
        : []
      for (const person of people) {
        ctx.mailer.send(
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
      res.status(201).json((await present([row], user))[0])
    },
  )

  router.get('/assignments/:id', auth, validate({ params: idParamsSchema }), async (req, res) => {
    const user = currentUser(req)
    const { assignment } = await assignmentFor(ds, user, String(req.params.id), 'read')
    res.json((await present([assignment], user))[0])
  })

  router.patch(
    '/assignments/:id',
    auth,
    staff,
    validate({ params: idParamsSchema, body: updateAssignmentRequestSchema }),
    async (req, res) => {
      const user = currentUser(req)
      const { assignment } = await assignmentFor(ds, user, String(req.params.id), 'manage')
      const changes = req.body as UpdateAssignmentRequest
      const next: AssignmentRow = {
        ...assignment,
        title: changes.title || assignment.title,
        opensAt: changes.opensAt ? new Date(changes.opensAt).toISOString() : assignment.opensAt,
        dueAt: changes.dueAt ? new Date(changes.dueAt).toISOString() : assignment.dueAt,
        attemptLimit: changes.attemptLimit === undefined ? assignment.attemptLimit : changes.attemptLimit,
        hintsAllowed: changes.hintsAllowed ?? Boolean(assignment.hintsAllowed),
      }
      if (next.dueAt <= next.opensAt) {
        throw new HttpError(400, 'validation_failed', 'The due date must be after the opening date', {
          fields: { dueAt: ['Must be after the opening date'] },
        })
      }
      const { id: _id, ...fields } = next
      await ds.getRepository(AssignmentEntity).update({ id: assignment.id }, fields)
      res.json((await present([next], user))[0])
    },
  )

  router.delete('/assignments/:id', auth, staff, validate({ params: idParamsSchema }), async (req, res) => {
    const { assignment } = await assignmentFor(ds, currentUser(req), String(req.params.id), 'manage')
    if (await ds.getRepository(AttemptEntity).countBy({ assignmentId: assignment.id })) {
      throw conflict(
        'conflict',
        'This assignment already has attempts; change its dates instead of deleting it',
      )
    }
    await ds.getRepository(AssignmentEntity).delete({ id: assignment.id })
    res.status(204).end()
  })

  router.get(
    '/assignments/:id/stats',
    auth,
    staff,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      const { assignment } = await assignmentFor(ds, currentUser(req), String(req.params.id), 'manage')
      const members = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: assignment.cohortId })
      const byMember = await standingsByAssignmentAndUser(ds, [assignment.id])
      const standings = members.map((m) => byMember.get(`${assignment.id}:${m.userId}`) ?? NOT_STARTED)
      const graded = standings.filter((s) => s.bestScore !== null)
      const best = graded.map((s) => s.bestScore!)
      res.json({
        assignmentId: assignment.id,
        apprentices: members.length,
        attempted: graded.length,
        mean: mean(best),
        median: median(best),
        passRate: graded.length ? graded.filter((s) => s.passed).length / graded.length : null,
        histogram: histogram(best),
      })
    },
  )

  return router
}
