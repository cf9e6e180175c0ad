// The attempt in progress kept in this browser (localStorage), appended to as it grows: the log is
// stored in chunks of CHUNK_EVENTS, and an action rewrites only the last chunk and a small header,
// so saving costs the same at the end of a long attempt as at its start. localStorage rather than
// IndexedDB because its writes are synchronous: a tab closed right after an action still keeps it.
import { z } from 'zod'
import { attemptLogSchema, type AttemptEvent } from '@shared/model/events'
import { browserStorage } from '@/composables/browserStorage'

export const CHUNK_EVENTS = 200

const headerSchema = z.object({
  version: z.literal(2),
  attemptId: z.string().min(1),
  count: z.number().int().nonnegative(),
  chunks: z.number().int().nonnegative(),
  savedAt: z.string(),
})
type Header = z.infer<typeof headerSchema>

/** The first format: the whole log in one entry (still read, so an attempt saved before survives). */
const wholeLogSchema = z.object({
  version: z.literal(1),
  attemptId: z.string().min(1),
  events: attemptLogSchema,
  savedAt: z.string(),
})

export interface BrowserCopy {
  attemptId: string
  events: AttemptEvent[]
  savedAt: string
}

export interface AttemptStore {
  /** The saved attempt, or null; a damaged entry is set aside (never silently deleted) and reported. */
  load(): { copy: BrowserCopy | null; problem: string | null }
  /** Appends the events the store does not have yet; another attempt id starts the store afresh. */
  append(attemptId: string, events: readonly AttemptEvent[]): void
  clear(): void
}

export function attemptStorageKey(scenarioVersionId: string, assignmentId?: string): string {
  return `slipway.attempt.${assignmentId ? `assignment.${assignmentId}` : `practice.${scenarioVersionId}`}`
}

const chunkKey = (key: string, i: number) => `${key}.log.${i}`

export function createAttemptStore(
  key: string,
  storage: Storage = browserStorage('localStorage'),
): AttemptStore {
  let header: Header | null = null
  let tail: AttemptEvent[] = []

  function removeChunks(count: number) {
    for (let i = 0; i < count; i++) storage.removeItem(chunkKey(key, i))
  }

  function setAside(raw: string) {
    storage.setItem(`${key}.damaged.${Date.now()}`, raw)
    const parsed = headerSchema.safeParse(safeJson(raw))
    if (parsed.success) removeChunks(parsed.data.chunks)
    storage.removeItem(key)
    header = null
    tail = []
  }

  function readChunks(h: Header): AttemptEvent[] | null {
    const events: unknown[] = []
    for (let i = 0; i < h.chunks; i++) {
      const chunk = safeJson(storage.getItem(chunkKey(key, i)) ?? 'null')
      if (!Array.isArray(chunk)) return null
      events.push(...chunk)
    }
    const parsed = attemptLogSchema.safeParse(events)
    return parsed.success && parsed.data.length === h.count ? parsed.data : null
  }

  function write(next: Header) {
    try {
      storage.setItem(chunkKey(key, next.chunks - 1), JSON.stringify(tail))
      storage.setItem(key, JSON.stringify(next))
      header = next
    } catch {
      // Storage full or disabled: the attempt still lives in memory and is saved on the server.
      // Forget what was written, so the next save starts afresh instead of trusting a partial write.
      header = null
      tail = []
    }
  }

  return {
    load() {
      const raw = storage.getItem(key)
      if (raw === null) return { copy: null, problem: null }
      const value = safeJson(raw)
      const old = wholeLogSchema.safeParse(value)
      if (old.success) {
        header = null
        return {
          copy: { attemptId: old.data.attemptId, events: old.data.events, savedAt: old.data.savedAt },
          problem: null,
        }
      }
      const h = headerSchema.safeParse(value)
      const events = h.success ? readChunks(h.data) : null
      if (h.success && events) {
        header = h.data
        tail = events.slice((h.data.chunks - 1) * CHUNK_EVENTS)
        return { copy: { attemptId: h.data.attemptId, events, savedAt: h.data.savedAt }, problem: null }
      }
      setAside(raw)
      return {
        copy: null,
        problem:
          'The attempt saved in this browser could not be read; it was set aside and a new attempt started.',
      }
    },

    append(attemptId, events) {
      if (!header || header.attemptId !== attemptId || header.count > events.length) {
        // A new attempt (or the first save after an old-format load): start the chunks afresh.
        const old = safeJson(storage.getItem(key) ?? 'null')
        const parsed = headerSchema.safeParse(old)
        if (parsed.success) removeChunks(parsed.data.chunks)
        header = { version: 2, attemptId, count: 0, chunks: 0, savedAt: '' }
        tail = []
      }
      let { count, chunks } = header
      if (count === events.length && chunks > 0) return
      if (chunks === 0) chunks = 1
      let unwritten = false
      for (let i = count; i < events.length; i++) {
        if (tail.length === CHUNK_EVENTS) {
          // A full chunk is written once, then the next one starts empty.
          if (unwritten) write({ version: 2, attemptId, count, chunks, savedAt: new Date().toISOString() })
          tail = []
          chunks++
        }
        tail.push(events[i])
        count++
        unwritten = true
      }
      write({ version: 2, attemptId, count, chunks, savedAt: new Date().toISOString() })
    },

    clear() {
      const parsed = headerSchema.safeParse(safeJson(storage.getItem(key) ?? 'null'))
      if (parsed.success) removeChunks(parsed.data.chunks)
      storage.removeItem(key)
      header = null
      tail = []
    },
  }
}

function safeJson(raw: string): unknown {
  try {
    return JSON.parse(raw)
  } catch {
    return undefined
  }
}
