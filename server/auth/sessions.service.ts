// Sessions: an access token in the body, a rotating refresh token in an httpOnly cookie, with reuse detection.
import { randomUUID } from 'node:crypto'
import type { Request, Response } from 'express'
import type { EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import { REFRESH_COOKIE_NAME, type SessionResponse } from '@shared/api/auth'
import type { AppContext } from '../context'
import { RefreshTokenEntity, UserEntity, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { DAY, isoIn, nowIso } from '../infrastructure/clock'
import { presentUser } from '../services/presenters'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'

/** Inactivity limit: a refresh token unused for this long expires (each refresh starts a new one). */
export const REFRESH_TTL_MS = 7 * DAY
/** Absolute limit: however active, a session ends this long after its sign-in (OWASP ASVS). */
export const SESSION_MAX_MS = 30 * DAY
/** How long a just-rotated refresh token may still be presented (parallel requests of one client). */
export const ROTATION_GRACE_MS = 10_000
const COOKIE_PATH = '/api/auth'

function cookieOptions(ctx: AppContext) {
  return {
    httpOnly: true,
    sameSite: 'strict' as const,
    secure: ctx.config.publicBaseUrl.startsWith('https:'),
    path: COOKIE_PATH,
  }
}

export async function startSession(
  ctx: AppContext,
  res: Response,
  user: UserRow,
  familyId: string = randomUUID(),
  manager: EntityManager = ctx.dataSource.manager,
): Promise<SessionResponse> {
  await issueRefreshToken(ctx, res, manager, user.id, familyId)
  const access = ctx.tokens.issue({ sub: user.id, role: user.role, tv: user.tokenVersion })
  return { accessToken: access.token, expiresAt: access.expiresAt, user: presentUser(user) }
}

/** Stores a new refresh token of the family, sets its cookie, and returns its row id. */
async function issueRefreshToken(
  ctx: AppContext,
  res: Response,
  manager: EntityManager,
  userId: string,
  familyId: string,
): Promise<string> {
  const { token, hash } = newOpaqueToken()
  const id = randomUUID()
  await manager.getRepository(RefreshTokenEntity).insert({
    id,
    userId,
    familyId,
    tokenHash: hash,
    expiresAt: isoIn(REFRESH_TTL_MS),
    createdAt: nowIso(),
    revokedAt: null,
    replacedById: null,
  })
  res.cookie(REFRESH_COOKIE_NAME, token, { ...cookieOptions(ctx), maxAge: REFRESH_TTL_MS })
  return id
}

export function clearSessionCookie(ctx: AppContext, res: Response) {
  res.clearCookie(REFRESH_COOKIE_NAME, cookieOptions(ctx))
}

const cookieToken = (req: Request): string | undefined => {
  const value = (req.cookies as Record<string, unknown> | undefined)?.[REFRESH_COOKIE_NAME]
  return typeof value === 'string' && value.length > 0 ? value : undefined
}

/** Exchanges the cookie's refresh token for a new pair; a token used twice ends its whole family. */
export async function refreshSession(ctx: AppContext, req: Request, res: Response): Promise<SessionResponse> {
  const token = cookieToken(req)
  if (!token) throw new HttpError(401, 'refresh_token_missing', 'No session to refresh; sign in')
  const outcome = await ctx.dataSource.transaction(async (manager) => {
    const repo = manager.getRepository(RefreshTokenEntity)
    const row = await repo.findOneBy({ tokenHash: hashToken(token) })
    if (!row)
      return { error: new HttpError(401, 'refresh_token_invalid', 'This session is not valid; sign in') }
    // Two requests of one browser refreshing at once both present the same token: a token replaced
    // by rotation moments ago still rotates (within the grace period); anything later is reuse.
    const justRotated =
      row.revokedAt !== null &&
      row.replacedById !== null &&
      Date.now() - Date.parse(row.revokedAt) < ROTATION_GRACE_MS
    if (row.revokedAt && !justRotated) {
      await repo.update({ familyId: row.familyId, revokedAt: IsNull() }, { revokedAt: nowIso() })
      return {
        error: new HttpError(
          401,
          'refresh_token_reused',
          'This session was already used elsewhere and has been ended',
        ),
      }
    }
    const first = await repo.findOne({ where: { familyId: row.familyId }, order: { createdAt: 'ASC' } })
    const absoluteEnd = new Date(Date.parse(first?.createdAt ?? row.createdAt) + SESSION_MAX_MS).toISOString()
    if (row.expiresAt <= nowIso() || absoluteEnd <= nowIso()) {
      return { error: new HttpError(401, 'refresh_token_invalid', 'This session has expired; sign in') }
    }
    const user = await manager.getRepository(UserEntity).findOneBy({ id: row.userId })
    if (!user?.active)
      return { error: new HttpError(401, 'account_inactive', 'This account has been deactivated') }
    const nextId = await issueRefreshToken(ctx, res, manager, user.id, row.familyId)
    if (!row.revokedAt) await repo.update({ id: row.id }, { revokedAt: nowIso(), replacedById: nextId })
    const access = ctx.tokens.issue({ sub: user.id, role: user.role, tv: user.tokenVersion })
    return { session: { accessToken: access.token, expiresAt: access.expiresAt, user: presentUser(user) } }
  })
  if (outcome.error) {
    clearSessionCookie(ctx, res)
    throw outcome.error
  }
  return outcome.session!
}

export async function endSession(ctx: AppContext, req: Request, res: Response) {
  const token = cookieToken(req)
  if (token) {
    await ctx.dataSource
      .getRepository(RefreshTokenEntity)
      .update({ tokenHash: hashToken(token), revokedAt: IsNull() }, { revokedAt: nowIso() })
  }
  clearSessionCookie(ctx, res)
}

/** Ends every session of a user: refresh tokens revoked and outstanding access tokens invalidated. */
export async function endAllSessions(manager: EntityManager, userId: string) {
  await manager
    .getRepository(RefreshTokenEntity)
    .update({ userId, revokedAt: IsNull() }, { revokedAt: nowIso() })
  await manager.getRepository(UserEntity).increment({ id: userId }, 'tokenVersion', 1)
}
