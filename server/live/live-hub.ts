// One per app: the bus, the rows read once per change (every stream of this instance shares them) and the
// sweep that notices a session turning idle or disconnected — a change nobody posts, so every instance works
// it out for its own streams — and removes watchers whose instance stopped refreshing them.
import { LIVE_DISCONNECTED_AFTER_MS, LIVE_IDLE_AFTER_MS } from '@shared/api/live'
import type { DataSource } from 'typeorm'
import { In, LessThan } from 'typeorm'
import { LiveSessionEntity, LiveWatcherEntity } from '../entities'
import { findById } from '../infrastructure/database/lookups'
import { nowMs } from '../infrastructure/clock'
import type { Logger } from '../infrastructure/logging'
import { createLiveBus, type LiveBus, type LiveChange } from './live-bus'
import { connectionOf, type LiveThresholds } from './live.presenter'
import {
  openSessions,
  steadyFactsOf,
  watchersOf,
  WATCHER_STALE_MS,
  type LoadedSession,
  type SteadyFacts,
} from './live-rows'

/** Names, titles and cohorts of a session are read again after this long (a rename, a new enrolment). */
const STEADY_FACTS_MS = 60_000

export interface LiveHubOptions extends Partial<LiveThresholds> {
  /** How often the sweep runs (default 5 s). */
  sweepMs?: number
  /** SSE comment heartbeat (default 15 s). */
  heartbeatMs?: number
}

export interface LiveHub {
  bus: LiveBus
  limits: LiveThresholds
  heartbeatMs: number
  /** This instance's streams: subscribed to the bus, counted so the sweep runs only when someone listens. */
  subscribe(listener: (change: LiveChange) => void): () => void
  /** A session's row facts, read once per change however many streams ask. */
  loaded(attemptId: string): Promise<LoadedSession | null>
  /** Runs the sweep now (tests; the timer runs it every sweepMs). */
  sweep(): Promise<void>
  close(): Promise<void>
}

export function createLiveHub(
  ds: DataSource,
  log: Logger,
  options: LiveHubOptions & { postgresUrl?: string } = {},
): LiveHub {
  const bus = createLiveBus({ postgresUrl: options.postgresUrl, log })
  const limits: LiveThresholds = {
    idleAfterMs: options.idleAfterMs ?? LIVE_IDLE_AFTER_MS,
    disconnectedAfterMs: options.disconnectedAfterMs ?? LIVE_DISCONNECTED_AFTER_MS,
  }
  // Per change only the session's row is read again; who is watching when that changes; the rest now and then.
  const cache = new Map<string, Promise<LoadedSession | null>>()
  const watching = new Map<string, Promise<LoadedSession['facts']['watchers']>>()
  const steady = new Map<string, { readAt: number; facts: Promise<SteadyFacts> }>()
  // Registered first, so a stream reading after a change never gets the row from before it.
  bus.subscribe((change) => {
    if (change.what === 'resync') {
      cache.clear()
      watching.clear()
      steady.clear()
      return
    }
    cache.delete(change.attemptId)
    if (change.what === 'watchers') watching.delete(change.attemptId)
  })
  const remembered = <T>(map: Map<string, Promise<T>>, key: string, read: () => Promise<T>) => {
    let entry = map.get(key)
    if (!entry) {
      entry = read()
      map.set(key, entry)
      entry.catch(() => map.delete(key))
      if (map.size > 5000) map.clear()
    }
    return entry
  }
  async function load(attemptId: string): Promise<LoadedSession | null> {
    const session = await findById(ds, LiveSessionEntity, attemptId)
    if (!session) return null
    let facts = steady.get(attemptId)
    if (!facts || nowMs() - facts.readAt > STEADY_FACTS_MS) {
      facts = { readAt: nowMs(), facts: steadyFactsOf(ds, session) }
      steady.set(attemptId, facts)
      facts.facts.catch(() => steady.delete(attemptId))
      if (steady.size > 5000) steady.clear()
    }
    const [{ cohortIds, ...shown }, watchers] = await Promise.all([
      facts.facts,
      remembered(watching, attemptId, () => watchersOf(ds, attemptId, nowMs())),
    ])
    return { session, cohortIds, facts: { ...shown, watchers } }
  }
  let listeners = 0
  const lastWord = new Map<string, string>()

  async function sweep() {
    if (listeners === 0) return
    const now = nowMs()
    const sessions = await openSessions(ds, now)
    const seen = new Set<string>()
    for (const session of sessions) {
      seen.add(session.attemptId)
      const word = connectionOf(session, now, limits)
      const before = lastWord.get(session.attemptId)
      lastWord.set(session.attemptId, word)
      if (before !== undefined && before !== word)
        bus.emitLocal({ attemptId: session.attemptId, what: 'row' })
    }
    for (const id of lastWord.keys()) if (!seen.has(id)) lastWord.delete(id)
    const watchers = ds.getRepository(LiveWatcherEntity)
    const stale = await watchers.findBy({ seenAt: LessThan(new Date(now - WATCHER_STALE_MS).toISOString()) })
    if (stale.length) {
      await watchers.delete({ id: In(stale.map((w) => w.id)) })
      for (const attemptId of new Set(stale.map((w) => w.attemptId)))
        bus.publish({ attemptId, what: 'watchers' })
    }
  }

  let sweeping = false
  const timer = setInterval(() => {
    if (sweeping) return
    sweeping = true
    sweep()
      .catch((error: unknown) => log.warn({ err: error }, 'live sweep failed'))
      .finally(() => (sweeping = false))
  }, options.sweepMs ?? 5000)
  timer.unref()

  return {
    bus,
    limits,
    heartbeatMs: options.heartbeatMs ?? 15_000,
    subscribe(listener) {
      listeners++
      const off = bus.subscribe(listener)
      return () => {
        listeners--
        off()
      }
    },
    loaded(attemptId) {
      const entry = remembered(cache, attemptId, () => load(attemptId))
      // A missing session is read again next time (it may be opened meanwhile).
      void entry.then((loaded) => loaded ?? cache.delete(attemptId)).catch(() => undefined)
      return entry
    },
    sweep,
    async close() {
      clearInterval(timer)
      cache.clear()
      watching.clear()
      steady.clear()
      await bus.close()
    },
  }
}
