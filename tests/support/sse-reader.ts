// Reads a Server-Sent Events stream from a real listening server with fetch (as the client does, with the
// Authorization header), parsing `id:` / `event:` / `data:` frames as they arrive. `next()` waits for the
// next frame matching a test, so tests see what the server sent and in what order.
export interface SseFrame {
  id?: string
  event: string
  data: unknown
  /** When the frame was parsed (performance.now()). */
  at: number
}

export interface SseReader {
  status: number
  /** JSON body of a refused stream (status ≥ 400). */
  error?: unknown
  frames: SseFrame[]
  next(match?: (frame: SseFrame) => boolean, timeoutMs?: number): Promise<SseFrame>
  /** Resolves when the server ends the stream. */
  ended: Promise<void>
  close(): void
}

export async function readSse(
  url: string,
  token: string,
  headers: Record<string, string> = {},
  onFrame?: (frame: SseFrame) => void,
): Promise<SseReader> {
  const abort = new AbortController()
  const response = await fetch(url, {
    headers: { Authorization: `Bearer ${token}`, Accept: 'text/event-stream', ...headers },
    signal: abort.signal,
  })
  const frames: SseFrame[] = []
  let cursor = 0
  const waiters: (() => void)[] = []
  const wake = () => waiters.splice(0).forEach((w) => w())
  if (!response.ok || !response.body) {
    const text = await response.text()
    return {
      status: response.status,
      error: text ? JSON.parse(text) : undefined,
      frames,
      next: () => Promise.reject(new Error(`stream refused: ${response.status}`)),
      ended: Promise.resolve(),
      close() {},
    }
  }
  let done = false
  const ended = (async () => {
    const decoder = new TextDecoder()
    let buffer = ''
    try {
      for await (const chunk of response.body as unknown as AsyncIterable<Uint8Array>) {
        buffer += decoder.decode(chunk, { stream: true })
        let end: number
        while ((end = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, end)
          buffer = buffer.slice(end + 2)
          let id: string | undefined
          let event = 'message'
          const data: string[] = []
          for (const line of block.split('\n')) {
            if (line.startsWith('id: ')) id = line.slice(4)
            else if (line.startsWith('event: ')) event = line.slice(7)
            else if (line.startsWith('data: ')) data.push(line.slice(6))
          }
          if (!data.length) continue
          const frame = { id, event, data: JSON.parse(data.join('\n')) as unknown, at: performance.now() }
          frames.push(frame)
          onFrame?.(frame)
          wake()
        }
      }
    } catch {
      // Aborted by close().
    } finally {
      done = true
      wake()
    }
  })()
  return {
    status: response.status,
    frames,
    ended,
    async next(match = () => true, timeoutMs = 5000) {
      const deadline = Date.now() + timeoutMs
      for (;;) {
        while (cursor < frames.length) {
          const frame = frames[cursor++]!
          if (match(frame)) return frame
        }
        if (done) throw new Error('the stream ended before the frame came')
        const left = deadline - Date.now()
        if (left <= 0) throw new Error('no matching frame in time')
        await new Promise<void>((resolve) => {
          const timer = setTimeout(resolve, left)
          waiters.push(() => {
            clearTimeout(timer)
            resolve()
          })
        })
      }
    },
    close() {
      abort.abort()
    },
  }
}
