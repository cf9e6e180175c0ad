// /api/auth: sign-in, refresh, sign-out (one or all sessions), the current user, password reset and change.
import { randomUUID } from 'node:crypto'
import { Router } from 'express'
import { IsNull } from 'typeorm'
import {
  changePasswordRequestSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  signInRequestSchema,
  updateProfileRequestSchema,
  type ChangePasswordRequest,
  type PasswordResetConfirm,
  type PasswordResetRequest,
  type SignInRequest,
  type UpdateProfileRequest,
} from '@shared/api/auth'
import { appLink, type AppContext } from '../context'
import { PasswordResetEntity, UserEntity } from '../entities'
import { HttpError } from '../http-error'
import { authenticate, currentUser } from '../middleware/auth'
import { validate } from '../middleware/validate'
import { HOUR, isoIn, nowIso } from '../infrastructure/clock'
import { passwordResetMail } from '../infrastructure/mail/templates'
import { presentUser } from '../services/presenters'
import { endAllSessions, endSession, refreshSession, startSession } from './sessions.service'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'

const RESET_TTL_MS = HOUR

export function authRouter(ctx: AppContext): Router {
  const router = Router()
  const users = () => ctx.dataSource.getRepository(UserEntity)
  const auth = authenticate(ctx)

  // A hash to verify against when the e-mail is unknown, so both paths take the same time.
  let decoyHash: Promise<string> | undefined
  const decoy = () => (decoyHash ??= ctx.passwords.hash(randomUUID()))

  router.post('/sign-in', ctx.limits.signIn, validate({ body: signInRequestSchema }), async (req, res) => {
    const { email, password } = req.body as SignInRequest
    const user = await users().findOneBy({ email })
    const ok = await ctx.passwords.verify(user?.passwordHash ?? (await decoy()), password)
    if (!user || !ok) throw new HttpError(401, 'invalid_credentials', 'The e-mail or password is not right')
    if (!user.active) throw new HttpError(401, 'account_inactive', 'This account has been deactivated')
    user.lastSignInAt = nowIso()
    await users().update({ id: user.id }, { lastSignInAt: user.lastSignInAt })
    res.json(await startSession(ctx, res, user))
  })

  router.post('/refresh', async (req, res) => {
    res.json(await refreshSession(ctx, req, res))
  })

  router.post('/sign-out', async (req, res) => {
    await endSession(ctx, req, res)
    res.status(204).end()
  })

  router.post('/sign-out-everywhere', auth, async (req, res) => {
    await ctx.dataSource.transaction((manager) => endAllSessions(manager, currentUser(req).id))
    await endSession(ctx, req, res)
    res.status(204).end()
  })

  router.get('/me', auth, (req, res) => {
    res.json({ user: presentUser(currentUser(req)) })
  })

  router.patch('/me', auth, validate({ body: updateProfileRequestSchema }), async (req, res) => {
    const user = currentUser(req)
    const { name } = req.body as UpdateProfileRequest
    await users().update({ id: user.id }, { name, updatedAt: nowIso() })
    res.json({ user: presentUser({ ...user, name }) })
  })

  router.post('/change-password', auth, validate({ body: changePasswordRequestSchema }), async (req, res) => {
    const user = currentUser(req)
    const body = req.body as ChangePasswordRequest
    if (!(await ctx.passwords.verify(user.passwordHash, body.currentPassword))) {
      throw new HttpError(400, 'validation_failed', 'The current password is not right', {
        fields: { currentPassword: ['The current password is not right'] },
      })
    }
    const passwordHash = await ctx.passwords.hash(body.newPassword)
    const fresh = await ctx.dataSource.transaction(async (manager) => {
      await manager.getRepository(UserEntity).update({ id: user.id }, { passwordHash, updatedAt: nowIso() })
      await endAllSessions(manager, user.id) // other sessions end after a password change (ASVS)
      return manager.getRepository(UserEntity).findOneByOrFail({ id: user.id })
    })
    res.json(await startSession(ctx, res, fresh))
  })

  const resetLimit = ctx.limits.passwordReset

  // Always 202, known address or not, so the answer reveals nothing about who has an account.
  router.post(
    '/password-reset',
    resetLimit,
    validate({ body: passwordResetRequestSchema }),
    async (req, res) => {
      const { email } = req.body as PasswordResetRequest
      const user = await users().findOneBy({ email })
      if (user?.active) {
        const { token, hash } = newOpaqueToken()
        await ctx.dataSource.getRepository(PasswordResetEntity).insert({
          id: randomUUID(),
          userId: user.id,
          tokenHash: hash,
          expiresAt: isoIn(RESET_TTL_MS),
          usedAt: null,
          createdAt: nowIso(),
        })
        ctx.mailer.send(
          passwordResetMail({
            to: user.email,
            name: user.name,
            url: appLink(ctx, `/reset-password?token=${encodeURIComponent(token)}`),
            minutes: RESET_TTL_MS / 60_000,
          }),
        )
      }
      res.status(202).json({ message: 'If that address has an account, a reset link is on its way' })
    },
  )

  router.post(
    '/password-reset/confirm',
    resetLimit,
    validate({ body: passwordResetConfirmSchema }),
    async (req, res) => {
      const { token, password } = req.body as PasswordResetConfirm
      const passwordHash = await ctx.passwords.hash(password)
      const user = await ctx.dataSource.transaction(async (manager) => {
        const resets = manager.getRepository(PasswordResetEntity)
        const reset = await resets.findOneBy({ tokenHash: hashToken(token), usedAt: IsNull() })
        if (!reset || reset.expiresAt <= nowIso()) {
          throw new HttpError(400, 'reset_token_invalid', 'This reset link has expired or was already used')
        }
        // Using one link spends every other outstanding link of the account too.
        await resets.update({ userId: reset.userId, usedAt: IsNull() }, { usedAt: nowIso() })
        await manager
          .getRepository(UserEntity)
          .update({ id: reset.userId }, { passwordHash, updatedAt: nowIso() })
        await endAllSessions(manager, reset.userId)
        return manager.getRepository(UserEntity).findOneByOrFail({ id: reset.userId })
      })
      if (!user.active) throw new HttpError(401, 'account_inactive', 'This account has been deactivated')
      res.json(await startSession(ctx, res, user))
    },
  )

  return router
}
