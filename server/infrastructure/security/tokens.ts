// Access tokens (short-lived JWT) and opaque one-time tokens (refresh, invitation, reset) stored as hashes.
import { createHash, createSecretKey, randomBytes } from 'node:crypto'
import jwt from 'jsonwebtoken'
import { LRUCache } from 'lru-cache'
import { ACCESS_TOKEN_TTL_SECONDS, type Role } from '@shared/api/auth'
import { HttpError } from '../../http-error'

export interface AccessClaims {
  sub: string
  role: Role
  tv: number // the user's token version when issued
}

export interface AccessTokens {
  issue(claims: AccessClaims): { token: string; expiresAt: string }
  verify(token: string): AccessClaims
}

const ISSUER = 'slipway'

export function createAccessTokens(secretText: string, ttlSeconds = ACCESS_TOKEN_TTL_SECONDS): AccessTokens {
  // A KeyObject made once: given a string, jsonwebtoken first tries (and fails) to parse it as a public
  // key on every call, which cost more than the rest of the verification.
  const secret = createSecretKey(Buffer.from(secretText, 'utf8'))
  // Tokens already verified, so a client's every request does not recompute the HMAC: whether a token's
  // signature is valid depends only on the token and the secret. Revocation is not cached — authenticate()
  // still compares the claims' token version with the live user on every request.
  const verified = new LRUCache<string, { claims: AccessClaims; expiresAtMs: number }>({ max: 10_000 })
  return {
    issue(claims) {
      const token = jwt.sign({ role: claims.role, tv: claims.tv }, secret, {
        algorithm: 'HS256',
        subject: claims.sub,
        issuer: ISSUER,
        expiresIn: ttlSeconds,
      })
      return { token, expiresAt: new Date(Date.now() + ttlSeconds * 1000).toISOString() }
    },
    verify(token) {
      const known = verified.get(token)
      if (known) {
        // The same expiry rule as jsonwebtoken's: expired from the second `exp` names.
        if (Date.now() < known.expiresAtMs) return known.claims
        verified.delete(token)
        throw new HttpError(401, 'token_expired', 'Your session has expired; refresh or sign in again')
      }
      try {
        const payload = jwt.verify(token, secret, { algorithms: ['HS256'], issuer: ISSUER }) as jwt.JwtPayload
        if (typeof payload.sub !== 'string' || typeof payload.tv !== 'number')
          throw new Error('claims missing')
        const claims: AccessClaims = { sub: payload.sub, role: payload.role as Role, tv: payload.tv }
        if (typeof payload.exp === 'number') verified.set(token, { claims, expiresAtMs: payload.exp * 1000 })
        return claims
      } catch (error) {
        if (error instanceof jwt.TokenExpiredError) {
          throw new HttpError(401, 'token_expired', 'Your session has expired; refresh or sign in again')
        }
        throw new HttpError(401, 'token_invalid', 'The access token is not valid')
      }
    },
  }
}

/** A random URL-safe token; only its SHA-256 is stored. */
export function newOpaqueToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString('base64url')
  return { token, hash: hashToken(token) }
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}
