// The cookies of the platform's browser flow (HTTP only; the rules are in login, launch and session services).
// Both are SameSite=None; Secure; Partitioned: sent inside the platform's frame, kept per top-level site
// (CHIPS), and never shared with the standalone sign-in. Secure is always set — browsers refuse
// SameSite=None otherwise — and browsers accept it on http://localhost for development.
import type { Response } from 'express'
import type { SessionResponse } from '@shared/api/auth'
import { REFRESH_TTL_MS } from '../auth/sessions.service'

export const FRAMED_REFRESH_COOKIE = 'slipway_lti_refresh'
const FRAMED_REFRESH_PATH = '/api/lti/session'
const LOGIN_BINDING_PATH = '/api/lti/launch'

const crossSite = { httpOnly: true, secure: true, sameSite: 'none' as const, partitioned: true }

export function setBindingCookie(res: Response, binding: { name: string; value: string; maxAgeMs: number }) {
  res.cookie(binding.name, binding.value, {
    ...crossSite,
    path: LOGIN_BINDING_PATH,
    maxAge: binding.maxAgeMs,
  })
}

export function clearBindingCookie(res: Response, name: string) {
  res.clearCookie(name, { ...crossSite, path: LOGIN_BINDING_PATH })
}

export function framedRefreshToken(req: { cookies?: Record<string, unknown> }): string | undefined {
  const value = req.cookies?.[FRAMED_REFRESH_COOKIE]
  return typeof value === 'string' && value.length > 0 ? value : undefined
}

export function sendFramedSession(res: Response, issued: { session: SessionResponse; refreshToken: string }) {
  res.cookie(FRAMED_REFRESH_COOKIE, issued.refreshToken, {
    ...crossSite,
    path: FRAMED_REFRESH_PATH,
    maxAge: REFRESH_TTL_MS,
  })
  res.json(issued.session)
}

export function clearFramedSession(res: Response) {
  res.clearCookie(FRAMED_REFRESH_COOKIE, { ...crossSite, path: FRAMED_REFRESH_PATH })
}
