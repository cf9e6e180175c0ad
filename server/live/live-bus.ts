// Fan-out of live changes. Every instance has an in-process bus (an EventEmitter); on PostgreSQL each change
// also goes out as a NOTIFY on one channel, and a dedicated `pg` client LISTENs for the other instances'
// changes. A change is small — which attempt, and what about it changed — and whoever receives it reads the
// rows it needs, so nothing large crosses the channel and nothing depends on which instance took the post.
import { randomUUID } from 'node:crypto'
import { EventEmitter } from 'node:events'
import pg from 'pg'
import type { Logger } from '../infrastructure/logging'

export const LIVE_CHANNEL = 'slipway_live'

/**
 * `events`: new log events (the row changed too); `row`: status or connection changed; `watchers`: who is
 * watching changed; `inbox`: a new injection or message for the apprentice; `ended`: submitted or closed;
 * `resync`: this instance may have missed changes (the listening connection dropped) — readers catch up.
 */
export type LiveChangeKind = 'events' | 'row' | 'watchers' | 'inbox' | 'ended' | 'resync'

export interface LiveChange {
  attemptId: string
  what: LiveChangeKind
}

export interface LiveBus {
  /** To every instance (this one at once). */
  publish(change: LiveChange): void
  /** To this instance's subscribers only (the sweep's connection changes, which every instance computes). */
  emitLocal(change: LiveChange): void
  subscribe(listener: (change: LiveChange) => void): () => void
  close(): Promise<void>
}

const KINDS = new Set<string>(['events', 'row', 'watchers', 'inbox', 'ended', 'resync'])

export function createLiveBus(options: { postgresUrl?: string; log: Logger }): LiveBus {
  const emitter = new EventEmitter()
  // Every open stream subscribes: hundreds are normal, not a leak.
  emitter.setMaxListeners(0)
  const emitLocal = (change: LiveChange) => emitter.emit('change', change)
  const instanceId = randomUUID()
  const remote = options.postgresUrl
    ? createPgChannel(options.postgresUrl, instanceId, emitLocal, options.log)
    : null
  return {
    publish(change) {
      emitLocal(change)
      remote?.notify(change)
    },
    emitLocal,
    subscribe(listener) {
      remote?.start()
      emitter.on('change', listener)
      return () => emitter.off('change', listener)
    },
    async close() {
      emitter.removeAllListeners()
      await remote?.close()
    },
  }
}

/** The PostgreSQL side: one connection that LISTENs and NOTIFYs, reconnecting after a drop. */
function createPgChannel(
  url: string,
  instanceId: string,
  deliver: (change: LiveChange) => void,
  log: Logger,
) {
  let client: pg.Client | null = null
  let connecting: Promise<pg.Client | null> | null = null
  let closed = false
  let retry: NodeJS.Timeout | undefined
  let sending: Promise<unknown> = Promise.resolve()

  function connect(): Promise<pg.Client | null> {
    if (closed) return Promise.resolve(null)
    connecting ??= (async () => {
      const next = new pg.Client({ connectionString: url, application_name: 'slipway-live' })
      next.on('notification', (message) => {
        const [from, attemptId, what] = (message.payload ?? '').split('|')
        if (from === instanceId || !attemptId || !what || !KINDS.has(what)) return
        deliver({ attemptId, what: what as LiveChangeKind })
      })
      next.on('error', (error) => {
        log.warn({ err: error }, 'live channel: the listening connection failed; reconnecting')
        if (client === next) client = null
        connecting = null
        next.end().catch(() => undefined)
        clearTimeout(retry)
        retry = setTimeout(() => {
          // Changes may have passed while the connection was down: streams read what they missed.
          void connect().then((c) => c && deliver({ attemptId: '*', what: 'resync' }))
        }, 1000)
        retry.unref()
      })
      try {
        await next.connect()
        await next.query(`LISTEN ${LIVE_CHANNEL}`)
      } catch (error) {
        log.warn({ err: error }, 'live channel: could not listen')
        connecting = null
        await next.end().catch(() => undefined)
        return null
      }
      if (closed) {
        await next.end().catch(() => undefined)
        return null
      }
      client = next
      return next
    })()
    return connecting
  }

  return {
    start() {
      void connect()
    },
    notify(change: LiveChange) {
      // One query at a time on the connection: notifications go out in the order they were made.
      sending = sending
        .then(() => connect())
        .then((c) =>
          c?.query('SELECT pg_notify($1, $2)', [
            LIVE_CHANNEL,
            `${instanceId}|${change.attemptId}|${change.what}`,
          ]),
        )
        .catch((error: unknown) => log.warn({ err: error }, 'live channel: a change could not be sent'))
    },
    async close() {
      closed = true
      clearTimeout(retry)
      await sending
      const c = client ?? (connecting ? await connecting : null)
      client = null
      await c?.end().catch(() => undefined)
    },
  }
}
