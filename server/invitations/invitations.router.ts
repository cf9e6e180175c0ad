// /api/invitations/:token — public: preview an invitation and accept it by choosing a password.
// (Staff invite from the cohort routes and the admin routes; the rules are all in invitations.service.ts.)
import { Router } from 'express'
import { acceptInvitationRequestSchema, invitationTokenParamsSchema } from '@shared/api/invitations'
import { sendSession } from '../auth/session-cookie'
import type { AppContext } from '../context'
import { validate } from '../middleware/validate'
import { acceptInvitation, previewInvitation } from './invitations.service'

export function invitationsRouter(ctx: AppContext): Router {
  const router = Router()
  const limit = ctx.limits.invitations

  router.get('/:token', limit, validate({ params: invitationTokenParamsSchema }), async (req, res) => {
    res.json(await previewInvitation(ctx, req.params.token))
  })

  router.post(
    '/:token/accept',
    limit,
    validate({ params: invitationTokenParamsSchema, body: acceptInvitationRequestSchema }),
    async (req, res) => {
      sendSession(ctx, res, await acceptInvitation(ctx, req.params.token, req.body), 201)
    },
  )

  return router
}
