// enqueueScorePost(...): grades on their way to platforms, retried with backoff. This is the in-process
// implementation, to be replaced by the durable job queue (server/infrastructure/jobs/, kind
// 'lti.score-post', dedupe key `lti-score:<assignment>:<apprentice>`) once it lands: the interface is what
// passback.service.ts uses. Durability does not rest on this process's timers: every pending post is a row
// in lti_score_syncs in state 'waiting', and a starting server enqueues those rows again (runtime.ts).
export interface ScorePost {
  assignmentId: string
  userId: string
}

export type ScorePostOutcome = 'done' | 'retry'

/** Sends one post; told which try this is and whether it is the last one allowed. */
export type ScorePostHandler = (
  post: ScorePost,
  attempt: { number: number; last: boolean },
) => Promise<ScorePostOutcome>

export interface ScorePostQueue {
  /** Schedules a post; a post already waiting for the same assignment and apprentice is not doubled. */
  enqueueScorePost(post: ScorePost, options?: { delayMs?: number }): void
  /** Resolves when nothing is waiting or running (tests, shutdown). */
  idle(): Promise<void>
  close(): void
}

/** Backoff between tries: seconds at first, then minutes; after the last the post is marked failed. */
export const DEFAULT_RETRY_DELAYS_MS = [5_000, 30_000, 2 * 60_000, 10 * 60_000, 30 * 60_000]

interface Entry {
  timer?: NodeJS.Timeout
  running?: Promise<void>
  /** A change arrived while the post was running: send again afterwards. */
  again: boolean
  attempt: number
}

export function createInProcessScoreQueue(
  handler: ScorePostHandler,
  options: { retryDelaysMs?: number[]; onError?: (error: unknown) => void } = {},
): ScorePostQueue {
  const delays = options.retryDelaysMs ?? DEFAULT_RETRY_DELAYS_MS
  const entries = new Map<string, Entry>()
  const idleWaiters: (() => void)[] = []
  let closed = false
  const keyOf = (post: ScorePost) => `${post.assignmentId}:${post.userId}`

  function settleIfIdle() {
    if (entries.size === 0) for (const resolve of idleWaiters.splice(0)) resolve()
  }

  function schedule(post: ScorePost, entry: Entry, delayMs: number) {
    entry.timer = setTimeout(() => {
      entry.timer = undefined
      run(post, entry)
    }, delayMs)
    // A waiting retry never keeps a stopping process alive: its row stays 'waiting' for the next start.
    entry.timer.unref()
  }

  function run(post: ScorePost, entry: Entry) {
    if (closed) return
    const key = keyOf(post)
    const number = entry.attempt + 1
    entry.running = handler(post, { number, last: number > delays.length })
      .catch((error): ScorePostOutcome => {
        options.onError?.(error)
        return 'retry'
      })
      .then((outcome) => {
        entry.running = undefined
        if (entry.again) {
          // A newer grade: start over with a fresh count of tries.
          entry.again = false
          entry.attempt = 0
          schedule(post, entry, 0)
        } else if (outcome === 'retry' && number <= delays.length && !closed) {
          entry.attempt = number
          schedule(post, entry, delays[number - 1]!)
        } else {
          entries.delete(key)
          settleIfIdle()
        }
      })
  }

  return {
    enqueueScorePost(post, { delayMs = 0 } = {}) {
      if (closed) return
      const existing = entries.get(keyOf(post))
      if (existing) {
        if (existing.running) existing.again = true
        else if (existing.timer && existing.attempt > 0) {
          // Waiting to retry an older grade: send the new one now instead.
          clearTimeout(existing.timer)
          existing.attempt = 0
          schedule(post, existing, delayMs)
        }
        return
      }
      const entry: Entry = { again: false, attempt: 0 }
      entries.set(keyOf(post), entry)
      schedule(post, entry, delayMs)
    },
    idle() {
      if (entries.size === 0) return Promise.resolve()
      return new Promise((resolve) => idleWaiters.push(resolve))
    },
    close() {
      closed = true
      for (const entry of entries.values()) clearTimeout(entry.timer)
      entries.clear()
      settleIfIdle()
    },
  }
}
