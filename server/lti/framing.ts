// Framing: Slipway refuses to be framed (CSP frame-ancestors 'none') except by the registered platforms'
// pages, whose launches show it inside the course. Without a registered platform nothing changes. Applied
// to the client's pages and the LTI routes; the rest of the API answers JSON and keeps 'none'.
import type { IncomingMessage, ServerResponse } from 'node:http'
import type { AppContext } from '../context'
import type { Middleware } from '../middleware/validate'
import { ltiRuntime } from './runtime'

/** The frame-ancestors sources for a page Slipway shows inside a platform. */
export async function frameAncestorsFor(ctx: AppContext): Promise<string> {
  const origins = await ltiRuntime(ctx).frameOrigins.origins()
  return origins.length ? origins.join(' ') : "'none'"
}

const framable = (path: string) => !path.startsWith('/api/') || path.startsWith('/api/lti/')

type WithLocals = ServerResponse & { locals?: Record<string, unknown> }

export function framingFor(ctx: AppContext) {
  return {
    /** Before helmet: reads the allowed origins (from memory, at most every few seconds from the database). */
    resolve: ((req, res, next) => {
      if (!framable(req.path)) return next()
      frameAncestorsFor(ctx).then((sources) => {
        res.locals.frameAncestors = sources
        next()
      }, next)
    }) as Middleware,
    /** helmet's frame-ancestors directive. */
    directive: (_req: IncomingMessage, res: ServerResponse) =>
      ((res as WithLocals).locals?.frameAncestors as string | undefined) ?? "'none'",
    /** After helmet: X-Frame-Options cannot name origins; with frame-ancestors present it is redundant. */
    dropFrameOptions: ((_req, res, next) => {
      if (res.locals.frameAncestors && res.locals.frameAncestors !== "'none'")
        res.removeHeader('X-Frame-Options')
      next()
    }) as Middleware,
  }
}
