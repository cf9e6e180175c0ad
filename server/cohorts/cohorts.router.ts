// /api/cohorts: cohorts, their members, and invitations into them (one address or a roster CSV).
import { Router } from 'express'
import { idParamsSchema } from '@shared/api/common'
import {
  cohortListQuerySchema,
  cohortMemberParamsSchema,
  cohortMessageRequestSchema,
  createCohortRequestSchema,
  removeMembersRequestSchema,
  updateCohortRequestSchema,
} from '@shared/api/cohorts'
import {
  cohortInvitationParamsSchema,
  inviteRequestSchema,
  rosterImportQuerySchema,
} from '@shared/api/invitations'
import type { AppContext } from '../context'
import { uploadMiddleware } from '../infrastructure/storage/uploads'
import {
  inviteRoster,
  inviteToCohort,
  pendingCohortInvitations,
  ROSTER_UPLOAD,
} from '../invitations/invitations.service'
import { newInvitationLink, resendInvitation, revokeInvitation } from '../invitations/pending.service'
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
import { messageMembers, removeMembers } from './bulk.service'

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

  // Several members at once: a message by e-mail, or removal (POST: DELETE carries no body reliably).
  router.post(
    '/:id/messages',
    staff,
    validate({ params: idParamsSchema, body: cohortMessageRequestSchema }),
    async (req, res) => {
      res.json(await messageMembers(ctx, currentUser(req), req.params.id, req.body))
    },
  )

  router.post(
    '/:id/members/remove',
    staff,
    validate({ params: idParamsSchema, body: removeMembersRequestSchema }),
    async (req, res) => {
      res.json(await removeMembers(ctx, currentUser(req), req.params.id, req.body.userIds))
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
      await revokeInvitation(ctx, currentUser(req), { cohortId: req.params.id }, req.params.invitationId)
      res.status(204).end()
    },
  )

  router.post(
    '/:id/invitations/:invitationId/resend',
    staff,
    inviteLimit,
    validate({ params: cohortInvitationParamsSchema }),
    async (req, res) => {
      const scope = { cohortId: req.params.id }
      res.json({ invitation: await resendInvitation(ctx, currentUser(req), scope, req.params.invitationId) })
    },
  )

  router.post(
    '/:id/invitations/:invitationId/link',
    staff,
    inviteLimit,
    validate({ params: cohortInvitationParamsSchema }),
    async (req, res) => {
      const scope = { cohortId: req.params.id }
      res.json(await newInvitationLink(ctx, currentUser(req), scope, req.params.invitationId))
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
    validate({ params: idParamsSchema, query: rosterImportQuerySchema }),
    uploadMiddleware(ROSTER_UPLOAD),
    async (req, res) => {
      res.status(201).json(await inviteRoster(ctx, currentUser(req), req.params.id, req.file, req.query.rows))
    },
  )

  return router
}
