// Server-Sent Events on a plain Express response: the headers that keep proxies from buffering, `id:` /
// `event:` / `data:` frames, a comment every 15 s so idle connections stay open, and an end that comes from
// either side — the client going away, or the server draining for a shutdown (lifecycle.onDrain).
import type { Request, Response } from 'express'
import type { Lifecycle } from '../infrastructure/http/lifecycle'

export const SSE_HEARTBEAT_MS = 15_000

export interface SseStream {
  /** One event; `data` is sent as JSON on one line. Ignored once the stream has ended. */
  send(event: string, data: unknown, id?: string | number): void
  /** Runs on every heartbeat (e.g. to refresh a watcher's row). */
  onHeartbeat(listener: () => void): void
  /** Runs once when the stream ends, whichever side ended it. */
  onClose(listener: () => void): void
  readonly closed: boolean
  end(): void
}

/** What a stream reads of its request (whatever the route's validated types). */
export type StreamRequest = Pick<Request, 'socket' | 'get'>

/**
 * Where a reconnecting reader left off: the `Last-Event-ID` header, else `?after=` (validated by the route);
 * undefined when neither is given.
 */
export function resumeAfter(req: StreamRequest, after: number | undefined): number | undefined {
  const raw = req.get('last-event-id')?.trim()
  if (raw && /^\d{1,15}$/.test(raw)) return Number(raw)
  return after
}

export function openSse(
  req: StreamRequest,
  res: Response,
  lifecycle: Lifecycle,
  heartbeatMs = SSE_HEARTBEAT_MS,
): SseStream {
  res.status(200)
  res.setHeader('Content-Type', 'text/event-stream; charset=utf-8')
  // no-transform: no proxy may compress (and so buffer) the stream; X-Accel-Buffering for nginx-like proxies.
  res.setHeader('Cache-Control', 'no-cache, no-transform')
  res.setHeader('Connection', 'keep-alive')
  res.setHeader('X-Accel-Buffering', 'no')
  res.flushHeaders()
  req.socket.setNoDelay(true)
  // Tell an EventSource-style reader how long to wait before reconnecting.
  res.write('retry: 2000\n\n')

  let closed = false
  const closeListeners: (() => void)[] = []
  const heartbeatListeners: (() => void)[] = []
  const heartbeat = setInterval(() => {
    if (closed) return
    res.write(': keep-alive\n\n')
    for (const listener of heartbeatListeners) listener()
  }, heartbeatMs)
  heartbeat.unref()

  const finish = () => {
    if (closed) return
    closed = true
    clearInterval(heartbeat)
    unregister()
    for (const listener of closeListeners) {
      try {
        listener()
      } catch {
        // A listener's failure must not keep the others from running.
      }
    }
  }
  const unregister = lifecycle.onDrain(() => stream.end())
  res.once('close', finish)

  const stream: SseStream = {
    get closed() {
      return closed
    },
    send(event, data, id) {
      if (closed) return
      let frame = ''
      if (id !== undefined) frame += `id: ${id}\n`
      frame += `event: ${event}\ndata: ${JSON.stringify(data)}\n\n`
      res.write(frame)
    },
    onHeartbeat(listener) {
      heartbeatListeners.push(listener)
    },
    onClose(listener) {
      if (closed) listener()
      else closeListeners.push(listener)
    },
    end() {
      if (!res.writableEnded) res.end()
      finish()
    },
  }
  return stream
}
