// The apprentice's live publisher: opens the session, posts the log's events in order and never more than
// about three times a second, keeps a heartbeat, sends again from where the server says on 409, and backs
// off quietly while the server is away (the panel never waits for it).
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import type { LiveStatus, PostLiveEventsRequest } from '@shared/api/live'
import { LIVE_HEARTBEAT_MS } from '@shared/api/live'
import type { AttemptEvent } from '@shared/model/events'
import { createLivePublisher, MIN_POST_INTERVAL_MS } from '@/live/livePublisher'

const status: LiveStatus = {
  powerOn: false,
  ownLock: true,
  supervisorLock: false,
  driveState: 'Dark',
  outputHz: 0,
  alarms: [],
  safetyViolations: 0,
  objectivesMet: 0,
  objectivesTotal: 4,
}
const ev = (t: number): AttemptEvent => ({ t, type: 'meter.mode', mode: 'acVolts' })
const failure = (status: number, code = 'x', details?: unknown) =>
  Object.assign(new Error(`failed ${status}`), { status, code, details })

function bench(post: (body: PostLiveEventsRequest) => Promise<unknown>, openCount = 0) {
  const log: AttemptEvent[] = []
  const posts: PostLiveEventsRequest[] = []
  const states: string[] = []
  let opened = 0
  const publisher = createLivePublisher({
    open: async () => {
      opened += 1
      return { attemptId: 'a', eventCount: openCount }
    },
    post: async (body) => {
      posts.push(structuredClone(body))
      return post(body)
    },
    log: () => log,
    status: () => status,
    onState: (s) => states.push(s),
  })
  return { log, posts, states, publisher, opens: () => opened }
}

beforeEach(() => vi.useFakeTimers())
afterEach(() => vi.useRealTimers())

describe('the live publisher', () => {
  it('opens the session, then posts new events in order, batched, no more than ~3 posts a second', async () => {
    const { log, posts, publisher, opens } = bench(async () => ({}))
    publisher.start()
    await vi.advanceTimersByTimeAsync(0)
    expect(opens()).toBe(1)
    expect(posts).toHaveLength(1)
    expect(posts[0]).toMatchObject({ from: 0, events: [], status })
    // Ten actions in a burst, one every 20 ms.
    for (let i = 1; i <= 10; i++) {
      log.push(ev(i * 100))
      publisher.notify()
      await vi.advanceTimersByTimeAsync(20)
    }
    await vi.advanceTimersByTimeAsync(1000)
    const sentEvents = posts.flatMap((p) => p.events)
    expect(sentEvents.map((e) => e.t)).toEqual(log.map((e) => e.t))
    // Each post starts where the previous one ended.
    posts.reduce((next, p) => (expect(p.from).toBe(next), next + p.events.length), 0)
    // 1.2 s of work: the opening post plus at most four (one per 350 ms).
    expect(posts.length).toBeLessThanOrEqual(1 + Math.ceil(1200 / MIN_POST_INTERVAL_MS))
    expect(publisher.sentCount()).toBe(10)
    publisher.stop()
  })

  it('sends a heartbeat while nothing happens', async () => {
    const { posts, publisher } = bench(async () => ({}))
    publisher.start()
    await vi.advanceTimersByTimeAsync(0)
    await vi.advanceTimersByTimeAsync(LIVE_HEARTBEAT_MS * 3)
    expect(posts).toHaveLength(4)
    expect(posts.every((p) => p.events.length === 0)).toBe(true)
    publisher.stop()
  })

  it('resends from the count the server expects when it is out of step (409)', async () => {
    let first = true
    const { log, posts, publisher } = bench(async (body) => {
      // The server lost the reply to an earlier post: it holds only one event.
      if (first && body.from === 2) {
        first = false
        throw failure(409, 'live_out_of_step', { expected: 1 })
      }
      return {}
    }, 2)
    log.push(ev(1), ev(2), ev(3))
    publisher.start()
    await vi.advanceTimersByTimeAsync(0)
    expect(posts[0]).toMatchObject({ from: 2 })
    await vi.advanceTimersByTimeAsync(MIN_POST_INTERVAL_MS)
    expect(posts[1]!.from).toBe(1)
    expect(posts[1]!.events.map((e) => e.t)).toEqual([2, 3])
    expect(publisher.sentCount()).toBe(3)
    publisher.stop()
  })

  it('backs off quietly while the server is away, and catches up in order when it is back', async () => {
    let away = true
    const { log, posts, states, publisher } = bench(async () => {
      if (away) throw failure(503)
      return {}
    })
    log.push(ev(1))
    publisher.start()
    await vi.advanceTimersByTimeAsync(0)
    expect(states).toContain('retrying')
    const tries = () => posts.length
    // 1 s, 2 s, 4 s …: over 7 s three more tries, not one per notify.
    for (let i = 2; i <= 20; i++) {
      log.push(ev(i))
      publisher.notify()
    }
    await vi.advanceTimersByTimeAsync(7_000)
    expect(tries()).toBe(4)
    away = false
    await vi.advanceTimersByTimeAsync(8_000)
    const delivered = posts.slice(-1)[0]!
    expect(delivered.from).toBe(0)
    expect(delivered.events).toHaveLength(20)
    expect(states.at(-1)).toBe('live')
    publisher.stop()
  })

  it('opens the session again when the server no longer knows it', async () => {
    let gone = true
    const { publisher, opens } = bench(async () => {
      if (gone) {
        gone = false
        throw failure(404, 'not_found')
      }
      return {}
    })
    publisher.start()
    await vi.advanceTimersByTimeAsync(1500)
    expect(opens()).toBe(2)
    publisher.stop()
  })
})
