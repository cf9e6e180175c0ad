// Keeps an attempt in progress (its id and event log) in localStorage, so a reload loses nothing.
import { z } from 'zod'
import { attemptLogSchema, type AttemptEvent } from '@shared/model/events'

const storedAttemptSchema = z.object({
  version: z.literal(1),
  attemptId: z.string().min(1),
  events: attemptLogSchema,
  savedAt: z.string(),
})
export type StoredAttempt = z.infer<typeof storedAttemptSchema>

export function attemptStorageKey(scenarioId: string, assignmentId?: string): string {
  return `slipway.attempt.${assignmentId ? `assignment.${assignmentId}` : `practice.${scenarioId}`}`
}

export interface AttemptStorage {
  /** The saved attempt, or null; a damaged entry is set aside (never silently deleted) and reported. */
  load(): { attempt: StoredAttempt | null; problem: string | null }
  save(attemptId: string, events: readonly AttemptEvent[]): void
  clear(): void
}

export function useAttemptStorage(key: string, storage: Storage = window.localStorage): AttemptStorage {
  return {
    load() {
      const raw = storage.getItem(key)
      if (raw === null) return { attempt: null, problem: null }
      let parsed: unknown
      try {
        parsed = JSON.parse(raw)
      } catch {
        parsed = undefined
      }
      const result = storedAttemptSchema.safeParse(parsed)
      if (result.success) return { attempt: result.data, problem: null }
      storage.setItem(`${key}.damaged.${Date.now()}`, raw)
      storage.removeItem(key)
      return {
        attempt: null,
        problem:
          'The attempt saved in this browser could not be read; it was set aside and a new attempt started.',
      }
    },
    save(attemptId, events) {
      const value: StoredAttempt = {
        version: 1,
        attemptId,
        events: [...events],
        savedAt: new Date().toISOString(),
      }
      try {
        storage.setItem(key, JSON.stringify(value))
      } catch {
        // Storage full or disabled: the attempt still lives in memory and is sent to the server.
      }
    },
    clear() {
      storage.removeItem(key)
    },
  }
}
