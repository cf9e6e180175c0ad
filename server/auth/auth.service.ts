// Signing in, the signed-in user's own profile and password, and password reset by e-mail.
import { randomUUID } from 'node:crypto'
import { IsNull } from 'typeorm'
import type { ChangePasswordRequest, PasswordResetConfirm, SignInRequest, User } from '@shared/api/auth'
import { appLink, type AppContext } from '../context'
import { PasswordResetEntity, UserEntity, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { HOUR, isoIn, nowIso } from '../infrastructure/clock'
import { queueMail } from '../infrastructure/mail/mail-job'
import { passwordResetMail } from '../infrastructure/mail/templates'
import type { PasswordHasher } from '../infrastructure/security/passwords'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'
import { presentUser } from '../users/user.presenter'
import { endAllSessions, startSession, type IssuedSession } from './sessions.service'

const RESET_TTL_MS = HOUR

// A hash to verify against when the e-mail is unknown, so both paths take the same time.
const decoys = new WeakMap<PasswordHasher, Promise<string>>()
function decoyHash(passwords: PasswordHasher): Promise<string> {
  let hash = decoys.get(passwords)
  if (!hash) decoys.set(passwords, (hash = passwords.hash(randomUUID())))
  return hash
}

export async function signIn(ctx: AppContext, { email, password }: SignInRequest): Promise<IssuedSession> {
  const users = ctx.dataSource.getRepository(UserEntity)
  const user = await users.findOneBy({ email })
  const ok = await ctx.passwords.verify(user?.passwordHash ?? (await decoyHash(ctx.passwords)), password)
  if (!user || !ok) throw new HttpError(401, 'invalid_credentials', 'The e-mail or password is not right')
  if (!user.active) throw new HttpError(401, 'account_inactive', 'This account has been deactivated')
  user.lastSignInAt = nowIso()
  await users.update({ id: user.id }, { lastSignInAt: user.lastSignInAt })
  return startSession(ctx, user)
}

/** Ends every session of the user (all devices); the caller also clears this one's cookie. */
export async function signOutEverywhere(ctx: AppContext, user: UserRow): Promise<void> {
  await ctx.dataSource.transaction((manager) => endAllSessions(manager, user.id))
}

export async function renameSelf(ctx: AppContext, user: UserRow, name: string): Promise<User> {
  await ctx.dataSource.getRepository(UserEntity).update({ id: user.id }, { name, updatedAt: nowIso() })
  return presentUser({ ...user, name })
}

/** A new password for the signed-in user; every other session ends (ASVS), this one starts afresh. */
export async function changePassword(
  ctx: AppContext,
  user: UserRow,
  { currentPassword, newPassword }: ChangePasswordRequest,
): Promise<IssuedSession> {
  if (!(await ctx.passwords.verify(user.passwordHash, currentPassword))) {
    throw new HttpError(400, 'validation_failed', 'The current password is not right', {
      fields: { currentPassword: ['The current password is not right'] },
    })
  }
  const passwordHash = await ctx.passwords.hash(newPassword)
  const fresh = await ctx.dataSource.transaction(async (manager) => {
    await manager.getRepository(UserEntity).update({ id: user.id }, { passwordHash, updatedAt: nowIso() })
    await endAllSessions(manager, user.id)
    return manager.getRepository(UserEntity).findOneByOrFail({ id: user.id })
  })
  return startSession(ctx, fresh)
}

/** Mails a one-time reset link to an active account; says nothing either way (the route always answers 202). */
export async function requestPasswordReset(ctx: AppContext, email: string): Promise<void> {
  const user = await ctx.dataSource.getRepository(UserEntity).findOneBy({ email })
  if (!user?.active) return
  const { token, hash } = newOpaqueToken()
  await ctx.dataSource.transaction(async (manager) => {
    await manager.getRepository(PasswordResetEntity).insert({
      id: randomUUID(),
      userId: user.id,
      tokenHash: hash,
      expiresAt: isoIn(RESET_TTL_MS),
      usedAt: null,
      createdAt: nowIso(),
    })
    await queueMail(
      manager,
      passwordResetMail({
        to: user.email,
        name: user.name,
        url: appLink(ctx, `/reset-password?token=${encodeURIComponent(token)}`),
        minutes: RESET_TTL_MS / 60_000,
      }),
    )
  })
}

export async function confirmPasswordReset(
  ctx: AppContext,
  { token, password }: PasswordResetConfirm,
): Promise<IssuedSession> {
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
  return startSession(ctx, user)
}
