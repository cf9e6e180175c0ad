// /api/admin: accounts (list, role, deactivate, end sessions), instructor invitations, the outbox (and sending
// a failed message again), backups.
import { createReadStream } from 'node:fs'
import { Router } from 'express'
import { outboxQuerySchema } from '@shared/api/admin'
import { idParamsSchema } from '@shared/api/common'
import { inviteRequestSchema, pendingInvitationQuerySchema } from '@shared/api/invitations'
import { updateUserRequestSchema, userListQuerySchema } from '@shared/api/users'
import type { AppContext } from '../context'
import { nowIso } from '../infrastructure/clock'
import { inviteInstructor } from '../invitations/invitations.service'
import {
  pendingInvitationPage,
  newInvitationLink,
  resendInvitation,
  revokeInvitation,
} from '../invitations/pending.service'
import { authenticate, currentUser, requireRole } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { changeUser, listUsers, signOutUser } from '../users/users.service'
import { makeBackup } from './admin.service'
import { listOutbox, retryOutboxMessage } from './outbox.service'

export function adminRouter(ctx: AppContext): Router {
  const router = Router()
  router.use(authenticate(ctx), requireRole('admin'))

  router.get('/users', validate({ query: userListQuerySchema }), async (req, res) => {
    res.json(await listUsers(ctx, req.query))
  })

  router.patch(
    '/users/:id',
    validate({ params: idParamsSchema, body: updateUserRequestSchema }),
    async (req, res) => {
      res.json({ user: await changeUser(ctx, currentUser(req), req.params.id, req.body) })
    },
  )

  router.post('/users/:id/sign-out', validate({ params: idParamsSchema }), async (req, res) => {
    await signOutUser(ctx, req.params.id)
    res.status(204).end()
  })

  router.post(
    '/invitations',
    ctx.limits.invitations,
    validate({ body: inviteRequestSchema }),
    async (req, res) => {
      res.status(201).json(await inviteInstructor(ctx, currentUser(req), req.body))
    },
  )

  // Everyone invited and not yet answered, instructors and apprentices alike; resend, new link, withdraw.
  router.get('/invitations', validate({ query: pendingInvitationQuerySchema }), async (req, res) => {
    res.json(await pendingInvitationPage(ctx, req.query))
  })

  router.post(
    '/invitations/:id/resend',
    ctx.limits.invitations,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json({ invitation: await resendInvitation(ctx, currentUser(req), 'any', req.params.id) })
    },
  )

  router.post(
    '/invitations/:id/link',
    ctx.limits.invitations,
    validate({ params: idParamsSchema }),
    async (req, res) => {
      res.json(await newInvitationLink(ctx, currentUser(req), 'any', req.params.id))
    },
  )

  router.delete('/invitations/:id', validate({ params: idParamsSchema }), async (req, res) => {
    await revokeInvitation(ctx, currentUser(req), 'any', req.params.id)
    res.status(204).end()
  })

  router.get('/outbox', validate({ query: outboxQuerySchema }), async (req, res) => {
    res.json(await listOutbox(ctx, req.query))
  })

  router.post('/outbox/:id/retry', validate({ params: idParamsSchema }), async (req, res) => {
    res.json({ message: await retryOutboxMessage(ctx, req.params.id) })
  })

  router.get('/backup', async (_req, res) => {
    const backup = await makeBackup(ctx)
    const stamp = nowIso().replace(/[:.]/g, '-')
    res.setHeader('Content-Type', 'application/vnd.sqlite3')
    res.setHeader('Content-Disposition', `attachment; filename="slipway-backup-${stamp}.sqlite"`)
    const stream = createReadStream(backup.path)
    stream.on('close', backup.remove)
    stream.pipe(res)
  })

  return router
}
