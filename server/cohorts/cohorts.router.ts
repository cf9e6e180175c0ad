// /api/cohorts: cohorts, their members, and invitations into them (one address or a roster CSV).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  cohortListQuerySchema,
  cohortMemberParamsSchema,
  createCohortRequestSchema,
  updateCohortRequestSchema,
} from '@shared/api/cohorts'
import { cohortInvitationParamsSchema, inviteRequestSchema } from '@shared/api/invitations'
import type { AppContext } from '../context'
import { uploadMiddleware } from '../infrastructure/storage/uploads'
import {
  inviteRoster,
  inviteToCohort,
  pendingCohortInvitations,
  ROSTER_UPLOAD,
  withdrawInvitation,
} from '../invitations/invitations.service'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import {
  createCohort,
  getCohort,
  listCohorts,
  listMembers,
  removeMember,
  updateCohort,
} from './cohorts.service'

export function cohortsRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx))
  const staff = requireRole('instructor', 'admin')
  const inviteLimit = ctx.limits.invitations

  router.get('/', validate({ query: cohortListQuerySchema }), async (req, res) => {
    res.json({ items: await listCohorts(ctx, currentUser(req), req.query) })
  })

  router.post('/', staff, validate({ body: createCohortRequestSchema }), async (req, res) => {
    res.status(201).json(await createCohort(ctx, currentUser(req), req.body))
  })

  router.get('/:id', validate({ params: idParamsSchema }), async (req, res) => {
    res.json(await getCohort(ctx, currentUser(req), req.params.id))
  })

  router.patch(
    '/:id',
    staff,
    validate({ params: idParamsSchema, body: updateCohortRequestSchema }),
    async (req, res) => {
      res.json(await updateCohort(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.get('/:id/members', staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ items: await listMembers(ctx, currentUser(req), req.params.id) })
  })

  router.delete(
    '/:id/members/:userId',
    staff,
    validate({ params: cohortMemberParamsSchema }),
    async (req, res) => {
      await removeMember(ctx, currentUser(req), req.params.id, req.params.userId)
      res.status(204).end()
    },
  )

  router.get('/:id/invitations', staff, validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ items: await pendingCohortInvitations(ctx, currentUser(req), req.params.id) })
  })

  router.delete(
    '/:id/invitations/:invitationId',
    staff,
    validate({ params: cohortInvitationParamsSchema }),
    async (req, res) => {
      await withdrawInvitation(ctx, currentUser(req), req.params.id, req.params.invitationId)
      res.status(204).end()
    },
  )

  router.post(
    '/:id/invitations',
    staff,
    inviteLimit,
    validate({ params: idParamsSchema, body: inviteRequestSchema }),
    async (req, res) => {
      res.status(201).json(await inviteToCohort(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  // The id is checked before the upload is read.
  router.post(
    '/:id/invitations/roster',
    staff,
    inviteLimit,
    validate({ params: idParamsSchema }),
    uploadMiddleware(ROSTER_UPLOAD),
    async (req, res) => {
      res.status(201).json({ items: await inviteRoster(ctx, currentUser(req), req.params.id, req.file) })
    },
  )

  return router
}
