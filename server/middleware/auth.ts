// authenticate (Bearer access token → req.auth, checked against the live user) and requireRole(...).
import type { Role } from '@shared/api/auth'
import type { AppContext } from '../context'
import { UserEntity, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { findById } from '../infrastructure/database/lookups'
import type { Middleware } from './validate'

export interface AuthInfo {
  user: UserRow
}

declare module 'express-serve-static-core' {
  interface Request {
    auth?: AuthInfo
  }
}

export function authenticate(ctx: AppContext): Middleware {
  return async (req, _res, next) => {
    // Several routers share a mount path (/api/cohorts, /api): the first one's check stands for the
    // rest of this request, so the token is verified and the account read once, not once per router.
    if (req.auth) return next()
    const header = req.headers.authorization
    if (!header?.startsWith('Bearer ')) {
      throw new HttpError(401, 'unauthenticated', 'Sign in first (no access token was sent)')
    }
    const claims = ctx.tokens.verify(header.slice('Bearer '.length).trim())
    const user = await findById(ctx.dataSource, UserEntity, claims.sub)
    if (!user || user.tokenVersion !== claims.tv) {
      throw new HttpError(401, 'token_invalid', 'This session has ended; sign in again')
    }
    if (!user.active) throw new HttpError(401, 'account_inactive', 'This account has been deactivated')
    req.auth = { user }
    next()
  }
}

export function requireRole(...roles: Role[]): Middleware {
  return (req, _res, next) => {
    const role = req.auth?.user.role
    if (!role) throw new HttpError(401, 'unauthenticated', 'Sign in first')
    if (!roles.includes(role))
      throw new HttpError(403, 'forbidden', `Only ${roles.join(' or ')} accounts may do this`)
    next()
  }
}

/** The signed-in user of a request that passed authenticate(). */
export function currentUser(req: { auth?: AuthInfo }): UserRow {
  if (!req.auth) throw new HttpError(401, 'unauthenticated', 'Sign in first')
  return req.auth.user
}
