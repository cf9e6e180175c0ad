// A request id for every request: taken from the proxy's X-Request-Id when it is a plain token, otherwise
// a new UUID; sent back in the X-Request-Id header and in every error body, and added to every log line
// written while the request is handled (the logger's mixin reads it from here).
import { AsyncLocalStorage } from 'node:async_hooks'
import { randomUUID } from 'node:crypto'
import type { RequestHandler } from 'express'

const storage = new AsyncLocalStorage<{ requestId: string }>()

/** The id of the request whose work is running now, if any. */
export const currentRequestId = (): string | undefined => storage.getStore()?.requestId

const SAFE_ID = /^[A-Za-z0-9._:-]{8,80}$/

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by requestContext() for every request. */
    requestId?: string
  }
}

export function requestContext(): RequestHandler {
  return (req, res, next) => {
    const incoming = req.headers['x-request-id']
    const requestId = typeof incoming === 'string' && SAFE_ID.test(incoming) ? incoming : randomUUID()
    req.requestId = requestId
    res.setHeader('X-Request-Id', requestId)
    storage.run({ requestId }, next)
  }
}
