// A Server-Sent Events reader on fetch, because EventSource cannot send the Authorization header every
// route needs. It parses the text/event-stream format (WHATWG HTML, "Server-sent events" §9.2.6: `event:`,
// `data:` lines joined by "\n", `id:`, `retry:`, a blank line ends an event), reconnects with back-off and
// sends `Last-Event-ID` so the server resumes after the last event this reader saw: nothing missed. What a
// repeat is depends on the stream (a log index, an inbox id, a row by attempt), so its consumer drops those.

export type StreamState = 'connecting' | 'open' | 'retrying' | 'closed'

export interface StreamMessage {
  event: string
  data: string
  id: string | null
}

export interface EventStreamOptions {
  /** The full URL (with /api). */
  url: string
  /** Headers for each connection (the access token at the time of connecting). */
  headers?: () => Record<string, string>
  /** Resume after this id on the first connection. */
  lastEventId?: string | null
  onMessage: (message: StreamMessage) => void
  onState?: (state: StreamState, problem: string | null) => void
  /** A refused connection (401): return true when it is worth connecting again (a refreshed token). */
  onUnauthorized?: () => Promise<boolean>
  /** Stop for good on these statuses (403, 404 …): the stream will not come back by retrying. */
  fatal?: (status: number) => boolean
  fetch?: typeof fetch
  /** Wait before the n-th reconnect (1-based). */
  retryDelayMs?: (tries: number) => number
}

export interface EventStream {
  close(): void
  /** Drop the connection and connect again at once (resuming from the last id). */
  reconnect(): void
  lastEventId(): string | null
}

const defaultDelay = (tries: number) => Math.min(30_000, 1000 * 2 ** Math.max(0, tries - 1))

/** Parses a text/event-stream body fed in chunks; calls `emit` per complete event. */
export function createSseParser(emit: (message: StreamMessage & { retry?: number }) => void) {
  let buffer = ''
  let event = ''
  let data: string[] = []
  let id: string | null = null
  let retry: number | undefined
  let sawData = false

  function line(text: string) {
    if (text === '') {
      if (sawData) emit({ event: event || 'message', data: data.join('\n'), id, retry })
      event = ''
      data = []
      sawData = false
      retry = undefined
      return
    }
    if (text.startsWith(':')) return
    const colon = text.indexOf(':')
    const field = colon < 0 ? text : text.slice(0, colon)
    let value = colon < 0 ? '' : text.slice(colon + 1)
    if (value.startsWith(' ')) value = value.slice(1)
    if (field === 'event') event = value
    else if (field === 'data') {
      data.push(value)
      sawData = true
    } else if (field === 'id' && !value.includes('\0')) id = value
    else if (field === 'retry' && /^\d+$/.test(value)) retry = Number(value)
  }

  return {
    push(chunk: string) {
      buffer += chunk
      let at: number
      while ((at = buffer.search(/\r\n|\r|\n/)) >= 0) {
        const end = buffer[at] === '\r' && buffer[at + 1] === '\n' ? at + 2 : at + 1
        // A lone \r at the end of a chunk may be the first half of \r\n: wait for the next chunk.
        if (buffer[at] === '\r' && at === buffer.length - 1) break
        line(buffer.slice(0, at))
        buffer = buffer.slice(end)
      }
    },
    /** Forget a half-read event (the connection dropped mid-event). */
    reset() {
      buffer = ''
      event = ''
      data = []
      sawData = false
    },
    /** The id in effect (the last `id:` line seen, kept across events as the format says). */
    lastId: () => id,
  }
}

export function openEventStream(options: EventStreamOptions): EventStream {
  const doFetch = options.fetch ?? ((input, init) => fetch(input, init))
  const delayOf = options.retryDelayMs ?? defaultDelay
  let lastId: string | null = options.lastEventId ?? null
  let closed = false
  let tries = 0
  let serverDelay: number | null = null
  let controller: AbortController | null = null
  let timer: ReturnType<typeof setTimeout> | null = null

  const state = (s: StreamState, problem: string | null = null) => options.onState?.(s, problem)

  function schedule(problem: string) {
    if (closed) return
    tries += 1
    state('retrying', problem)
    // The server's `retry:` is the shortest wait; a server that stays away is asked less and less often.
    timer = setTimeout(connect, Math.max(serverDelay ?? 0, delayOf(tries)))
  }

  async function connect() {
    timer = null
    if (closed) return
    controller = new AbortController()
    const mine = controller
    state('connecting')
    const parser = createSseParser((message) => {
      if (message.retry !== undefined) serverDelay = message.retry
      if (message.id !== null) lastId = message.id
      options.onMessage({ event: message.event, data: message.data, id: message.id })
    })
    try {
      const headers: Record<string, string> = { Accept: 'text/event-stream', ...options.headers?.() }
      if (lastId !== null) headers['Last-Event-ID'] = lastId
      const response = await doFetch(options.url, { headers, signal: mine.signal, cache: 'no-store' })
      if (response.status === 401 && options.onUnauthorized) {
        if (await options.onUnauthorized()) return void (mine === controller && connect())
      }
      if (!response.ok || !response.body) {
        if (options.fatal?.(response.status)) {
          closed = true
          state('closed', `The server refused the stream (${response.status}).`)
          return
        }
        return schedule(`The server answered ${response.status}.`)
      }
      tries = 0
      state('open')
      const reader = response.body.pipeThrough(new TextDecoderStream()).getReader()
      for (;;) {
        const { done, value } = await reader.read()
        if (done) break
        parser.push(value)
      }
      if (mine === controller) schedule('The stream ended.')
    } catch (error) {
      if (closed || mine !== controller) return
      schedule((error as Error)?.message ?? 'The connection was lost.')
    }
  }

  function stopCurrent() {
    if (timer) clearTimeout(timer)
    timer = null
    const c = controller
    controller = null
    c?.abort()
  }

  void connect()
  return {
    close() {
      closed = true
      stopCurrent()
      state('closed')
    },
    reconnect() {
      if (closed) return
      stopCurrent()
      tries = 0
      void connect()
    },
    lastEventId: () => lastId,
  }
}
