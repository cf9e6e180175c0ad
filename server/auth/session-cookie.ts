// The refresh token's cookie: httpOnly, SameSite=Strict, sent only to /api/auth (HTTP only; the session
// logic is in sessions.service.ts).
import type { Response } from 'express'
import { REFRESH_COOKIE_NAME } from '@shared/api/auth'
import type { AppContext } from '../context'
import { REFRESH_TTL_MS, type IssuedSession } from './sessions.service'

const COOKIE_PATH = '/api/auth'

function cookieOptions(ctx: AppContext) {
  return {
    httpOnly: true,
    sameSite: 'strict' as const,
    secure: ctx.config.publicBaseUrl.startsWith('https:'),
    path: COOKIE_PATH,
  }
}

/** The refresh token the request's cookie carries, if any. */
export function sessionCookie(req: { cookies?: Record<string, unknown> }): string | undefined {
  const value = req.cookies?.[REFRESH_COOKIE_NAME]
  return typeof value === 'string' && value.length > 0 ? value : undefined
}

export function clearSessionCookie(ctx: AppContext, res: Response) {
  res.clearCookie(REFRESH_COOKIE_NAME, cookieOptions(ctx))
}

/** Answers with a new session: its refresh token in the cookie, the access token in the body. */
export function sendSession(ctx: AppContext, res: Response, issued: IssuedSession, status = 200) {
  res.cookie(REFRESH_COOKIE_NAME, issued.refreshToken, { ...cookieOptions(ctx), maxAge: REFRESH_TTL_MS })
  res.status(status).json(issued.session)
}
