// The event-stream reader: the text/event-stream format as WHATWG HTML §9.2.6 defines it (fields, comments,
// multi-line data, CRLF), and reconnecting with Last-Event-ID so that nothing is missed; a batch resent
// after a reconnect is placed by its index, so nothing is doubled.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { createSseParser, openEventStream, type StreamMessage } from '@/live/sseReader'

function bodyOf(chunks: string[], keepOpen = false) {
  return new ReadableStream<Uint8Array>({
    start(controller) {
      const encoder = new TextEncoder()
      for (const c of chunks) controller.enqueue(encoder.encode(c))
      if (!keepOpen) controller.close()
    },
  })
}

describe('the event-stream format', () => {
  it('parses named events, ids, multi-line data and comments, across chunk boundaries and line endings', () => {
    const got: StreamMessage[] = []
    const parser = createSseParser((m) => got.push({ event: m.event, data: m.data, id: m.id }))
    parser.push(': a comment keeps the connection alive\n\nevent: row\nid: 7\ndata: {"a":')
    parser.push('1}\n\r\ndata: line one\r\ndata: line two\r')
    parser.push('\n\r\nevent: gone\ndata:x\n')
    expect(got).toEqual([
      { event: 'row', data: '{"a":1}', id: '7' },
      // The id stays in effect until another is given (the spec's "last event ID buffer").
      { event: 'message', data: 'line one\nline two', id: '7' },
    ])
    parser.push('\n')
    expect(got[2]).toEqual({ event: 'gone', data: 'x', id: '7' })
  })

  it('ignores an event with no data lines', () => {
    const got: StreamMessage[] = []
    const parser = createSseParser((m) => got.push(m))
    parser.push('event: row\nid: 3\n\n')
    expect(got).toEqual([])
  })
})

describe('reconnecting', () => {
  afterEach(() => vi.useRealTimers())

  it('sends Last-Event-ID after a drop and resumes from there', async () => {
    const requests: Headers[] = []
    const received: string[] = []
    const replies = [
      // First connection: two events, then the connection drops.
      () => new Response(bodyOf(['id: 1\nevent: row\ndata: a\n\n', 'id: 2\nevent: row\ndata: b\n\n'])),
      () => new Response(bodyOf(['id: 3\nevent: row\ndata: c\n\n'], true)),
    ]
    const fetchStub = vi.fn(async (_url: RequestInfo | URL, init?: RequestInit) => {
      requests.push(new Headers(init?.headers))
      return replies[requests.length - 1]!()
    })
    const states: string[] = []
    const stream = openEventStream({
      url: '/api/live/cohorts/c/stream',
      headers: () => ({ Authorization: 'Bearer t1' }),
      onMessage: (m) => received.push(m.data),
      onState: (s) => states.push(s),
      fetch: fetchStub as unknown as typeof fetch,
      retryDelayMs: () => 5,
    })
    await vi.waitFor(() => expect(received).toEqual(['a', 'b', 'c']))
    expect(requests[0]!.get('Last-Event-ID')).toBeNull()
    expect(requests[0]!.get('Authorization')).toBe('Bearer t1')
    expect(requests[1]!.get('Last-Event-ID')).toBe('2')
    expect(states).toContain('retrying')
    expect(stream.lastEventId()).toBe('3')
    stream.close()
    expect(states[states.length - 1]).toBe('closed')
  })

  it('backs off while the server is away and stops for good when refused', async () => {
    let calls = 0
    const delays: number[] = []
    const away = openEventStream({
      url: '/x',
      onMessage: () => {},
      fetch: (async () => {
        calls += 1
        throw new TypeError('Failed to fetch')
      }) as unknown as typeof fetch,
      retryDelayMs: (tries) => {
        delays.push(tries)
        return 1
      },
    })
    await vi.waitFor(() => expect(calls).toBeGreaterThanOrEqual(3))
    away.close()
    // Each failed try counts up, so the real delay (1 s, 2 s, 4 s …) grows.
    expect(delays.slice(0, 3)).toEqual([1, 2, 3])

    let refusedCalls = 0
    const states: [string, string | null][] = []
    openEventStream({
      url: '/y',
      onMessage: () => {},
      onState: (s, p) => states.push([s, p]),
      fatal: (status) => status === 403,
      fetch: (async () => {
        refusedCalls += 1
        return new Response('{}', { status: 403 })
      }) as unknown as typeof fetch,
      retryDelayMs: () => 1,
    })
    await vi.waitFor(() => expect(states.at(-1)?.[0]).toBe('closed'))
    await new Promise((r) => setTimeout(r, 20))
    expect(refusedCalls).toBe(1)
    expect(states.at(-1)?.[1]).toMatch(/refused/)
  })

  it('connects again after a refreshed token when the first try is refused as signed out', async () => {
    const tokens: (string | null)[] = []
    let token = 'old'
    const received: string[] = []
    openEventStream({
      url: '/z',
      headers: () => ({ Authorization: `Bearer ${token}` }),
      onMessage: (m) => received.push(m.data),
      onUnauthorized: async () => {
        token = 'new'
        return true
      },
      fetch: (async (_u: unknown, init?: RequestInit) => {
        const auth = new Headers(init?.headers).get('Authorization')
        tokens.push(auth)
        return auth === 'Bearer new'
          ? new Response(bodyOf(['id: 1\ndata: hello\n\n'], true))
          : new Response('{}', { status: 401 })
      }) as unknown as typeof fetch,
    })
    await vi.waitFor(() => expect(received).toEqual(['hello']))
    expect(tokens).toEqual(['Bearer old', 'Bearer new'])
  })
})

describe('placing a watch stream batch in the log held', () => {
  const ev = (t: number) => ({ t, type: 'meter.mode', mode: 'acVolts' }) as const
  it('appends only what is new, and calls a batch past the end a gap', async () => {
    const { placeBatch } = await import('@/live/placeBatch')
    expect(placeBatch(2, 2, [ev(3), ev(4)])).toEqual({ kind: 'append', events: [ev(3), ev(4)] })
    // A reconnect resends from index 1: the one already held is skipped, not doubled.
    expect(placeBatch(2, 1, [ev(2), ev(3)])).toEqual({ kind: 'append', events: [ev(3)] })
    expect(placeBatch(4, 1, [ev(2), ev(3)])).toEqual({ kind: 'append', events: [] })
    expect(placeBatch(2, 3, [ev(5)])).toEqual({ kind: 'gap' })
  })
})
