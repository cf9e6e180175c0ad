// /api/cohorts: cohorts, their members, and invitations into them (one address or a roster CSV).
import { randomUUID } from 'node:crypto'
import { Router } from 'express'
import { In, IsNull } from 'typeorm'
import { idParamsSchema } from '@shared/api/common'
import {
  cohortListQuerySchema,
  cohortMemberParamsSchema,
  createCohortRequestSchema,
  updateCohortRequestSchema,
  type Cohort,
  type UpdateCohortRequest,
} from '@shared/api/cohorts'
import {
  cohortInvitationParamsSchema,
  inviteRequestSchema,
  ROSTER_MAX_BYTES,
  type InviteRequest,
  type InviteOutcome,
} from '@shared/api/invitations'
import type { AppContext } from '../context'
import { CohortEntity, EnrollmentEntity, InvitationEntity, UserEntity, type CohortRow } from '../entities'
import { HttpError, notFound } from '../http-error'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { cohortFor, readableCohortIds } from '../access/access.service'
import { nowIso } from '../infrastructure/clock'
import { invite } from '../invitations/invitations.service'
import type { OutgoingMail } from '../infrastructure/mail/mailer'
import { presentInvitation } from '../services/presenters'
import { readRoster } from '../invitations/roster'
import { keepUpload, uploadedText, uploadMiddleware, type UploadKind } from '../infrastructure/storage/uploads'

const ROSTER_UPLOAD: UploadKind = {
  purpose: 'roster',
  field: 'roster',
  maxBytes: ROSTER_MAX_BYTES,
  extensions: ['.csv'],
  mimeTypes: ['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel'],
  label: 'roster',
}

export function cohortsRouter(ctx: AppContext): Router {
  const router = Router()
  const ds = ctx.dataSource
  router.use(authenticate(ctx))
  const staff = requireRole('instructor', 'admin')

  async function present(rows: CohortRow[]): Promise<Cohort[]> {
    if (rows.length === 0) return []
    const owners = await ds
      .getRepository(UserEntity)
      .findBy({ id: In([...new Set(rows.map((r) => r.ownerId))]) })
    const counts: { cohortId: string; n: number }[] = await ds
      .getRepository(EnrollmentEntity)
      .createQueryBuilder('e')
      .select('e.cohortId', 'cohortId')
      .addSelect('COUNT(*)', 'n')
      .where('e.cohortId IN (:...ids)', { ids: rows.map((r) => r.id) })
      .groupBy('e.cohortId')
      .getRawMany()
    return rows.map((row) => ({
      id: row.id,
      name: row.name,
      description: row.description,
      ownerId: row.ownerId,
      ownerName: owners.find((o) => o.id === row.ownerId)?.name ?? '',
      archived: Boolean(row.archived),
      memberCount: Number(counts.find((c) => c.cohortId === row.id)?.n ?? 0),
      createdAt: row.createdAt,
    }))
  }

  router.get('/', validate({ query: cohortListQuerySchema }), async (req, res) => {
    const { includeArchived } = req.query as unknown as { includeArchived: boolean }
    const ids = await readableCohortIds(ds, currentUser(req))
    const rows = await ds.getRepository(CohortEntity).find({
      where: { ...(ids ? { id: In(ids) } : {}), ...(includeArchived ? {} : { archived: false }) },
      order: { name: 'ASC' },
    })
    res.json({ items: await present(rows) })
  })

  router.post('/', staff, validate({ body: createCohortRequestSchema }), async (req, res) => {
    const user = currentUser(req)
    const body = req.body as { name: string; description: string; ownerId?: string }
    let ownerId = user.id
    if (body.ownerId && body.ownerId !== user.id) {
      if (user.role !== 'admin')
        throw new HttpError(403, 'forbidden', 'Only an admin can create a cohort for someone else')
      const owner = await ds.getRepository(UserEntity).findOneBy({ id: body.ownerId })
      if (owner?.role !== 'instructor') {
        throw new HttpError(400, 'validation_failed', 'The owner must be an instructor', {
          fields: { ownerId: ['Not an instructor'] },
        })
      }
      ownerId = owner.id
    }
    const row: CohortRow = {
      id: randomUUID(),
      name: body.name,
      description: body.description,
      ownerId,
      archived: false,
      createdAt: nowIso(),
    }
    await ds.getRepository(CohortEntity).insert(row)
    res.status(201).json((await present([row]))[0])
  })

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'read')
    res.json((await present([cohort]))[0])
  })

  router.patch(
    '/:id',
    staff,
    validate({ params: idParamsSchema, body: updateCohortRequestSchema }),
    async (req, res) => {
      const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
      const changes = req.body as UpdateCohortRequest
      const next = {
        ...cohort,
        ...Object.fromEntries(Object.entries(changes).filter(([, v]) => v !== undefined)),
      }
      await ds.getRepository(CohortEntity).update(
        { id: cohort.id },
        {
          name: next.name,
          description: next.description,
          archived: next.archived,
        },
      )
      res.json((await present([next]))[0])
    },
  )

  router.get('/:id/members', staff, validate({ params: idParamsSchema }), async (req, res) => {
    const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
    const enrollments = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
    const users = enrollments.length
      ? await ds.getRepository(UserEntity).findBy({ id: In(enrollments.map((e) => e.userId)) })
      : []
    const items = enrollments
      .map((e) => {
        const user = users.find((u) => u.id === e.userId)!
        return {
          userId: user.id,
          name: user.name,
          email: user.email,
          active: Boolean(user.active),
          enrolledAt: e.createdAt,
        }
      })
      .sort((a, b) => a.name.localeCompare(b.name))
    res.json({ items })
  })

  router.delete(
    '/:id/members/:userId',
    staff,
    validate({ params: cohortMemberParamsSchema }),
    async (req, res) => {
      const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
      const result = await ds
        .getRepository(EnrollmentEntity)
        .delete({ cohortId: cohort.id, userId: String(req.params.userId) })
      if (!result.affected) throw notFound('Member')
      res.status(204).end()
    },
  )

  router.get('/:id/invitations', staff, validate({ params: idParamsSchema }), async (req, res) => {
    const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
    const rows = await ds.getRepository(InvitationEntity).find({
      where: { cohortId: cohort.id, acceptedAt: IsNull() },
      order: { createdAt: 'DESC' },
    })
    res.json({ items: rows.filter((r) => r.expiresAt > nowIso()).map(presentInvitation) })
  })

  router.delete(
    '/:id/invitations/:invitationId',
    staff,
    validate({ params: cohortInvitationParamsSchema }),
    async (req, res) => {
      const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
      // Withdrawn = expired now; the link stops working and the record stays for the history.
      const result = await ds
        .getRepository(InvitationEntity)
        .update(
          { id: String(req.params.invitationId), cohortId: cohort.id, acceptedAt: IsNull() },
          { expiresAt: nowIso() },
        )
      if (!result.affected) throw notFound('Pending invitation')
      res.status(204).end()
    },
  )

  const inviteLimit = ctx.limits.invitations

  async function manageableOpenCohort(req: Parameters<typeof currentUser>[0]) {
    const cohort = await cohortFor(ds, currentUser(req), String(req.params.id), 'manage')
    if (cohort.archived)
      throw new HttpError(409, 'cohort_archived', 'This cohort is archived; restore it first')
    return cohort
  }

  router.post(
    '/:id/invitations',
    staff,
    inviteLimit,
    validate({ params: idParamsSchema, body: inviteRequestSchema }),
    async (req, res) => {
      const cohort = await manageableOpenCohort(req)
      const { email, name } = req.body as Required<InviteRequest>
      const { outcome, mail } = await ds.transaction((manager) =>
        invite(ctx, manager, { email, name, role: 'apprentice', cohort, inviter: currentUser(req) }),
      )
      if (mail) ctx.mailer.send(mail)
      res.status(201).json(outcome)
    },
  )

  router.post(
    '/:id/invitations/roster',
    staff,
    inviteLimit,
    validate({ params: idParamsSchema }),
    uploadMiddleware(ROSTER_UPLOAD),
    async (req, res) => {
      const cohort = await manageableOpenCohort(req)
      const { file, text } = uploadedText(req, ROSTER_UPLOAD)
      const { rows, errors } = readRoster(text)
      if (errors.length) {
        throw new HttpError(
          400,
          'roster_invalid',
          `The roster has ${errors.length} problem(s); nothing was imported`,
          {
            rows: errors,
          },
        )
      }
      const inviter = currentUser(req)
      const results = await ds.transaction(async (manager) => {
        const done: { outcome: InviteOutcome; mail?: OutgoingMail }[] = []
        for (const row of rows) {
          try {
            done.push(
              await invite(ctx, manager, {
                email: row.email,
                name: row.name,
                role: 'apprentice',
                cohort,
                inviter,
              }),
            )
          } catch (error) {
            if (error instanceof HttpError) {
              throw new HttpError(
                400,
                'roster_invalid',
                'The roster has 1 problem(s); nothing was imported',
                {
                  rows: [{ row: row.line, field: 'email', message: error.message }],
                },
              )
            }
            throw error
          }
        }
        await keepUpload(ctx, manager, inviter.id, ROSTER_UPLOAD, file)
        return done
      })
      for (const { mail } of results) if (mail) ctx.mailer.send(mail)
      res.status(201).json({ items: results.map((r) => r.outcome) })
    },
  )

  return router
}
