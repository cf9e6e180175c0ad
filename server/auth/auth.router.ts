// /api/auth: sign-in, refresh, sign-out (one or all sessions), the current user and their mail preferences,
// password reset and change.
import { Router } from 'express'
import {
  changePasswordRequestSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  signInRequestSchema,
  updateProfileRequestSchema,
} from '@shared/api/auth'
import { updateMailPreferencesRequestSchema } from '@shared/api/mail-preferences'
import type { AppContext } from '../context'
import { authenticate, currentUser } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { getMailPreferences, updateMailPreferences } from '../users/mail-preferences.service'
import { presentUser } from '../users/user.presenter'
import {
  changePassword,
  confirmPasswordReset,
  renameSelf,
  requestPasswordReset,
  signIn,
  signOutEverywhere,
} from './auth.service'
import { clearSessionCookie, sendSession, sessionCookie } from './session-cookie'
import { endSession, refreshSession, SessionEnded } from './sessions.service'

export function authRouter(ctx: AppContext): Router {
  const router = Router()
  const auth = authenticate(ctx)
  const resetLimit = ctx.limits.passwordReset

  router.post('/sign-in', ctx.limits.signIn, validate({ body: signInRequestSchema }), async (req, res) => {
    sendSession(ctx, res, await signIn(ctx, req.body))
  })

  router.post('/refresh', async (req, res) => {
    try {
      sendSession(ctx, res, await refreshSession(ctx, sessionCookie(req)))
    } catch (error) {
      if (error instanceof SessionEnded) clearSessionCookie(ctx, res)
      throw error
    }
  })

  router.post('/sign-out', async (req, res) => {
    await endSession(ctx, sessionCookie(req))
    clearSessionCookie(ctx, res)
    res.status(204).end()
  })

  router.post('/sign-out-everywhere', auth, async (req, res) => {
    await signOutEverywhere(ctx, currentUser(req))
    await endSession(ctx, sessionCookie(req))
    clearSessionCookie(ctx, res)
    res.status(204).end()
  })

  router.get('/me', auth, (req, res) => {
    res.json({ user: presentUser(currentUser(req)) })
  })

  router.patch('/me', auth, validate({ body: updateProfileRequestSchema }), async (req, res) => {
    res.json({ user: await renameSelf(ctx, currentUser(req), req.body.name) })
  })

  // Optional mail: due-date reminders (apprentices) and the daily digest (instructors).
  router.get('/me/mail-preferences', auth, async (req, res) => {
    res.json(await getMailPreferences(ctx, currentUser(req)))
  })

  router.patch(
    '/me/mail-preferences',
    auth,
    validate({ body: updateMailPreferencesRequestSchema }),
    async (req, res) => {
      res.json(await updateMailPreferences(ctx, currentUser(req), req.body))
    },
  )

  router.post('/change-password', auth, validate({ body: changePasswordRequestSchema }), async (req, res) => {
    sendSession(ctx, res, await changePassword(ctx, currentUser(req), req.body))
  })

  // Always 202, known address or not, so the answer reveals nothing about who has an account.
  router.post(
    '/password-reset',
    resetLimit,
    validate({ body: passwordResetRequestSchema }),
    async (req, res) => {
      await requestPasswordReset(ctx, req.body.email)
      res.status(202).json({ message: 'If that address has an account, a reset link is on its way' })
    },
  )

  router.post(
    '/password-reset/confirm',
    resetLimit,
    validate({ body: passwordResetConfirmSchema }),
    async (req, res) => {
      sendSession(ctx, res, await confirmPasswordReset(ctx, req.body))
    },
  )

  return router
}
