// Graceful shutdown for the HTTP side: counts the requests in flight, and once draining has begun (SIGTERM)
// answers every new request with a clean 503 and Retry-After — only the liveness check still answers —
// while the requests already in flight, submissions being graded among them, finish and are acknowledged.
import type { RequestHandler, Response } from 'express'
import { HttpError } from '../../http-error'

export interface Lifecycle {
  readonly draining: boolean
  readonly inFlight: number
  middleware: RequestHandler
  /** From now on new requests get 503; resolves when none is in flight (true) or after timeoutMs (false). */
  drain(timeoutMs: number): Promise<boolean>
  /**
   * Called once when draining begins: long-lived responses (event streams) end themselves here, so they do
   * not hold the shutdown until its timeout. Returns the way to unregister.
   */
  onDrain(listener: () => void): () => void
}

/** Still answered while draining: the process is alive (it is /api/ready that turns 503). */
const ALWAYS_ANSWERED = new Set(['/api/health', '/api/ready'])

export function createLifecycle(): Lifecycle {
  let draining = false
  const inFlight = new Set<Response>()
  let idle: (() => void) | undefined
  const drainListeners = new Set<() => void>()

  return {
    get draining() {
      return draining
    },
    get inFlight() {
      return inFlight.size
    },
    middleware(req, res, next) {
      if (draining) {
        // The client will not send another request on this connection.
        res.setHeader('Connection', 'close')
        if (!ALWAYS_ANSWERED.has(req.path)) {
          const refuse = () =>
            next(
              new HttpError(
                503,
                'shutting_down',
                'This server is restarting; nothing was saved. Try again in a moment.',
                undefined,
                { 'Retry-After': '5' },
              ),
            )
          // Read the body to its end first: answering and closing while the client is still sending
          // would reach it as a reset connection instead of the 503.
          const hasBody =
            req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0
          if (!hasBody || req.readableEnded) return refuse()
          req.once('end', refuse)
          req.resume()
          return
        }
      }
      inFlight.add(res)
      const done = () => {
        if (inFlight.delete(res) && inFlight.size === 0) idle?.()
      }
      res.once('finish', done)
      res.once('close', done)
      next()
    },
    onDrain(listener) {
      drainListeners.add(listener)
      return () => drainListeners.delete(listener)
    },
    drain(timeoutMs) {
      draining = true
      for (const listener of [...drainListeners]) listener()
      drainListeners.clear()
      // Answers still to come close their connections too, so no client sends on one that is about to go.
      for (const res of inFlight) if (!res.headersSent) res.setHeader('Connection', 'close')
      if (inFlight.size === 0) return Promise.resolve(true)
      return new Promise<boolean>((resolve) => {
        const timer = setTimeout(() => resolve(false), timeoutMs)
        idle = () => {
          clearTimeout(timer)
          resolve(true)
        }
      })
    },
  }
}
