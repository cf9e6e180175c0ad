// Per-route rate limits (express-rate-limit), configurable per app so tests can lower or disable them.
import { rateLimit, type Store } from 'express-rate-limit'
import type { RateLimitRule, RateLimits } from '../config'
import { HttpError } from '../http-error'
import { asMiddleware, type Middleware } from './validate'

const pass: Middleware = (_req, _res, next) => next()

/** Gives each limiter its counter store; none means the library's per-process MemoryStore. */
export type RateLimitStoreFactory = (which: keyof RateLimits) => Store

export function limiter(
  limits: RateLimits | false,
  which: keyof RateLimits,
  storeFor?: RateLimitStoreFactory,
): Middleware {
  if (!limits) return pass
  const rule: RateLimitRule = limits[which]
  return asMiddleware(
    rateLimit({
      ...(storeFor ? { store: storeFor(which) } : {}),
      windowMs: rule.windowMs,
      limit: rule.limit,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      handler: (_req, res, next) => {
        // Retry-After is set by the library in seconds; keep it and answer in our error format.
        const retryAfter = res.getHeader('Retry-After') ?? String(Math.ceil(rule.windowMs / 1000))
        next(
          new HttpError(429, 'rate_limited', 'Too many requests; wait a little and try again', undefined, {
            'Retry-After': String(retryAfter),
          }),
        )
      },
    }),
  )
}

export type Limiters = Record<keyof RateLimits, Middleware>

/** One limiter per kind for the whole app, so e.g. every invitation route draws on the same budget. */
export function createLimiters(limits: RateLimits | false, storeFor?: RateLimitStoreFactory): Limiters {
  return {
    signIn: limiter(limits, 'signIn', storeFor),
    passwordReset: limiter(limits, 'passwordReset', storeFor),
    invitations: limiter(limits, 'invitations', storeFor),
    ltiLaunch: limiter(limits, 'ltiLaunch', storeFor),
  }
}
