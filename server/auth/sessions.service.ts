// Sessions: an access token in the body, a rotating refresh token (kept in an httpOnly cookie by the
// router, session-cookie.ts) with reuse detection.
import { randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import { IsNull } from 'typeorm'
import type { SessionResponse } from '@shared/api/auth'
import type { AppContext } from '../context'
import { RefreshTokenEntity, UserEntity, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { DAY, isoIn, nowIso } from '../infrastructure/clock'
import { hashToken, newOpaqueToken } from '../infrastructure/security/tokens'
import { presentUser } from '../users/user.presenter'

/** Inactivity limit: a refresh token unused for this long expires (each refresh starts a new one). */
export const REFRESH_TTL_MS = 7 * DAY
/** Absolute limit: however active, a session ends this long after its sign-in (OWASP ASVS). */
export const SESSION_MAX_MS = 30 * DAY
/** How long a just-rotated refresh token may still be presented (parallel requests of one client). */
export const ROTATION_GRACE_MS = 10_000

/** A session as issued: the response body, and the refresh token the client keeps in its cookie. */
export interface IssuedSession {
  session: SessionResponse
  refreshToken: string
}

/** A refresh that failed because the session is over: the client's cookie should go too. */
export class SessionEnded extends HttpError {}

export async function startSession(
  ctx: AppContext,
  user: UserRow,
  manager: EntityManager = ctx.dataSource.manager,
): Promise<IssuedSession> {
  const { token } = await issueRefreshToken(manager, user.id, randomUUID())
  return { session: accessFor(ctx, user), refreshToken: token }
}

function accessFor(ctx: AppContext, user: UserRow): SessionResponse {
  const access = ctx.tokens.issue({ sub: user.id, role: user.role, tv: user.tokenVersion })
  return { accessToken: access.token, expiresAt: access.expiresAt, user: presentUser(user) }
}

/** Stores a new refresh token of the family; returns the token and its row id. */
async function issueRefreshToken(
  manager: EntityManager,
  userId: string,
  familyId: string,
): Promise<{ id: string; token: string }> {
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
  return { id, token }
}

/** Exchanges a refresh token for a new pair; a token used twice ends its whole family (SessionEnded). */
export async function refreshSession(ctx: AppContext, token: string | undefined): Promise<IssuedSession> {
  if (!token) throw new HttpError(401, 'refresh_token_missing', 'No session to refresh; sign in')
  const outcome = await ctx.dataSource.transaction(async (manager) => {
    const repo = manager.getRepository(RefreshTokenEntity)
    const row = await repo.findOneBy({ tokenHash: hashToken(token) })
    if (!row)
      return { error: new SessionEnded(401, 'refresh_token_invalid', 'This session is not valid; sign in') }
    // Two requests of one browser refreshing at once both present the same token: a token replaced
    // by rotation moments ago still rotates (within the grace period); anything later is reuse.
    const justRotated =
      row.revokedAt !== null &&
      row.replacedById !== null &&
      Date.now() - Date.parse(row.revokedAt) < ROTATION_GRACE_MS
    if (row.revokedAt && !justRotated) {
      await repo.update({ familyId: row.familyId, revokedAt: IsNull() }, { revokedAt: nowIso() })
      return {
        error: new SessionEnded(
          401,
          'refresh_token_reused',
          'This session was already used elsewhere and has been ended',
        ),
      }
    }
    const first = await repo.findOne({ where: { familyId: row.familyId }, order: { createdAt: 'ASC' } })
    const absoluteEnd = new Date(Date.parse(first?.createdAt ?? row.createdAt) + SESSION_MAX_MS).toISOString()
    if (row.expiresAt <= nowIso() || absoluteEnd <= nowIso()) {
      return { error: new SessionEnded(401, 'refresh_token_invalid', 'This session has expired; sign in') }
    }
    const user = await manager.getRepository(UserEntity).findOneBy({ id: row.userId })
    if (!user?.active)
      return { error: new SessionEnded(401, 'account_inactive', 'This account has been deactivated') }
    const next = await issueRefreshToken(manager, user.id, row.familyId)
    if (!row.revokedAt) await repo.update({ id: row.id }, { revokedAt: nowIso(), replacedById: next.id })
    return { issued: { session: accessFor(ctx, user), refreshToken: next.token } }
  })
  // Returned rather than thrown inside, so the family's revocation above commits.
  if (outcome.error) throw outcome.error
  return outcome.issued!
}

/** Signs one session out: its refresh token is revoked (the access token runs out within minutes). */
export async function endSession(ctx: AppContext, token: string | undefined): Promise<void> {
  if (!token) return
  await ctx.dataSource
    .getRepository(RefreshTokenEntity)
    .update({ tokenHash: hashToken(token), revokedAt: IsNull() }, { revokedAt: nowIso() })
}

/** Ends every session of a user: refresh tokens revoked and outstanding access tokens invalidated. */
export async function endAllSessions(manager: EntityManager, userId: string) {
  await manager
    .getRepository(RefreshTokenEntity)
    .update({ userId, revokedAt: IsNull() }, { revokedAt: nowIso() })
  await manager.getRepository(UserEntity).increment({ id: userId }, 'tokenVersion', 1)
}
