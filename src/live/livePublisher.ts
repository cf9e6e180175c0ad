// The apprentice's side of the live classroom: opens the live session of an attempt, then posts the log's
// new events in order with the bench's status, at most every MIN_POST_INTERVAL_MS while there is something
// new and at least every LIVE_HEARTBEAT_MS. The panel never waits for it: a server that is away is retried
// with back-off, quietly, and the events pile up in the log until it is back. The attempt itself is still
// saved and submitted through /api/attempts (the live copy is for watching only).
import {
  LIVE_EVENTS_PER_POST,
  LIVE_HEARTBEAT_MS,
  type LiveSession,
  type LiveStatus,
  type PostLiveEventsRequest,
} from '@shared/api/live'
import type { AttemptEvent } from '@shared/model/events'
import { isRetryable, retryDelayMs } from '@/simulator/machines/retry'

/** About three posts a second at most, however fast the apprentice works. */
export const MIN_POST_INTERVAL_MS = 350

export type PublisherState = 'opening' | 'live' | 'retrying' | 'refused' | 'stopped'

export interface PublisherDeps {
  open: () => Promise<LiveSession>
  post: (body: PostLiveEventsRequest) => Promise<unknown>
  /** The attempt's log (grows in place). */
  log: () => readonly AttemptEvent[]
  /** What the bench shows now; null while the panel is not ready (nothing is posted then). */
  status: () => LiveStatus | null
  onState?: (state: PublisherState) => void
  /** The session is open on the server (again): what needs it (the inbox stream) may start. */
  onOpened?: () => void
  now?: () => number
  setTimer?: (fn: () => void, ms: number) => unknown
  clearTimer?: (handle: unknown) => void
  minIntervalMs?: number
  heartbeatMs?: number
}

interface ErrorLike {
  status?: number
  code?: string
  details?: unknown
}

/** The server's count when it says the panel is out of step (409 live_out_of_step, details.expected). */
function expectedCount(error: unknown): number | null {
  const e = error as ErrorLike | null
  if (e?.status !== 409 || e.code !== 'live_out_of_step') return null
  const expected = (e.details as { expected?: unknown } | null)?.expected
  return typeof expected === 'number' && Number.isInteger(expected) && expected >= 0 ? expected : null
}

export function createLivePublisher(deps: PublisherDeps) {
  const now = deps.now ?? (() => Date.now())
  const setTimer = deps.setTimer ?? ((fn, ms) => setTimeout(fn, ms))
  const clearTimer = deps.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>))
  const minInterval = deps.minIntervalMs ?? MIN_POST_INTERVAL_MS
  const heartbeat = deps.heartbeatMs ?? LIVE_HEARTBEAT_MS

  let opened = false
  /** Events the server holds: the next post starts here. */
  let sent = 0
  let busy = false
  let stopped = false
  let tries = 0
  let lastPostAt = Number.NEGATIVE_INFINITY
  let timer: unknown = null
  let timerAt = Number.POSITIVE_INFINITY
  let state: PublisherState = 'opening'

  function setState(next: PublisherState) {
    if (next === state) return
    state = next
    deps.onState?.(next)
  }

  /** Run at `at` (or sooner when already due sooner). */
  function wake(at: number) {
    if (stopped) return
    if (timer !== null && timerAt <= at) return
    if (timer !== null) clearTimer(timer)
    timerAt = at
    timer = setTimer(
      () => {
        timer = null
        timerAt = Number.POSITIVE_INFINITY
        void step()
      },
      Math.max(0, at - now()),
    )
  }

  function pending() {
    return deps.log().length > sent
  }

  function retryLater() {
    tries += 1
    setState('retrying')
    wake(now() + retryDelayMs(tries))
  }

  async function step() {
    if (stopped || busy) return
    const status = deps.status()
    if (!status) return wake(now() + minInterval)
    busy = true
    try {
      if (!opened) {
        setState('opening')
        sent = (await deps.open()).eventCount
        opened = true
        deps.onOpened?.()
      }
      const events = deps.log().slice(sent, sent + LIVE_EVENTS_PER_POST)
      lastPostAt = now()
      await deps.post({ from: sent, events, status: deps.status() ?? status })
      sent += events.length
      tries = 0
      setState('live')
    } catch (error) {
      const expected = expectedCount(error)
      if (expected !== null) {
        // The server holds a different count (a lost reply, a reopened panel): send again from there.
        sent = Math.min(expected, deps.log().length)
        tries = 0
      } else if ((error as ErrorLike | null)?.status === 404) {
        opened = false
        return retryLater()
      } else if (isRetryable(error)) {
        return retryLater()
      } else {
        setState('refused')
        // A refusal will not change quickly; look again at the heartbeat's pace, not in a loop.
        return wake(now() + heartbeat)
      }
    } finally {
      busy = false
    }
    if (stopped) return
    wake(pending() ? Math.max(now(), lastPostAt + minInterval) : lastPostAt + heartbeat)
  }

  return {
    /** Something changed (new events): post soon, but not sooner than the minimum interval allows. */
    notify() {
      if (stopped || busy || state === 'retrying' || state === 'refused') return
      wake(Math.max(now(), lastPostAt + minInterval))
    },
    start() {
      wake(now())
    },
    stop() {
      stopped = true
      if (timer !== null) clearTimer(timer)
      timer = null
      setState('stopped')
    },
    /** Events the server holds, as far as this panel knows. */
    sentCount: () => sent,
    state: () => state,
  }
}

export type LivePublisher = ReturnType<typeof createLivePublisher>
