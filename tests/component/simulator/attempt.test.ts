// An attempt in progress survives a reload, and submission retries with the same attempt id.
import { describe, expect, it } from 'vitest'
import { effectScope } from 'vue'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model/events'
import { attemptStorageKey, useAttemptStorage } from '@/simulator/composables/useAttemptStorage'
import { isRetryable, useAttemptSubmission } from '@/simulator/composables/useAttemptSubmission'

class MemoryStorage implements Storage {
  private data = new Map<string, string>()
  get length() {
    return this.data.size
  }
  clear() {
    this.data.clear()
  }
  getItem(k: string) {
    return this.data.get(k) ?? null
  }
  key(i: number) {
    return [...this.data.keys()][i] ?? null
  }
  removeItem(k: string) {
    this.data.delete(k)
  }
  setItem(k: string, v: string) {
    this.data.set(k, v)
  }
}

const events: AttemptEvent[] = [
  { t: 0, type: 'lock.removed' },
  { t: 1500, type: 'power.on' },
]

describe('the attempt saved in the browser', () => {
  it('comes back after a reload with its id and every event', () => {
    const storage = new MemoryStorage()
    const key = attemptStorageKey('version-1')
    useAttemptStorage(key, storage).save('attempt-1', events)
    const { attempt, problem } = useAttemptStorage(key, storage).load()
    expect(problem).toBeNull()
    expect(attempt?.attemptId).toBe('attempt-1')
    expect(attempt?.events).toEqual(events)
  })

  it('keeps practice and assignment attempts apart', () => {
    expect(attemptStorageKey('v1')).not.toBe(attemptStorageKey('v1', 'assignment-9'))
  })

  it('sets a damaged entry aside instead of deleting it, and says so', () => {
    const storage = new MemoryStorage()
    const key = attemptStorageKey('version-1')
    storage.setItem(
      key,
      '{"version":1,"attemptId":"a","events":[{"t":5,"type":"power.on"},{"t":1,"type":"power.off"}]}',
    )
    const { attempt, problem } = useAttemptStorage(key, storage).load()
    expect(attempt).toBeNull()
    expect(problem).toMatch(/could not be read/)
    expect(storage.getItem(key)).toBeNull()
    expect(storage.key(0)).toMatch(/damaged/)
  })
})

describe('submitting an attempt', () => {
  const body: SubmitAttemptRequest = { id: 'attempt-7', scenarioId: 'v1', status: 'submitted', events }
  const summary = { id: 'attempt-7' } as AttemptSummary

  it('retries after network failures and server errors with the same attempt id until acknowledged', async () => {
    const seen: string[] = []
    const failures = [
      Object.assign(new Error('offline'), { status: 0 }),
      Object.assign(new Error('busy'), { status: 503 }),
    ]
    const scope = effectScope()
    const s = scope.run(() =>
      useAttemptSubmission({
        send: async (b) => {
          seen.push(b.id)
          const f = failures.shift()
          if (f) throw f
          return summary
        },
        delayMs: () => 1,
      }),
    )!
    await s.submit(body)
    expect(seen).toEqual(['attempt-7', 'attempt-7', 'attempt-7'])
    expect(s.status.value).toBe('done')
    expect(s.result.value).toEqual(summary)
    scope.stop()
  })

  it('stops at a client mistake instead of retrying it', async () => {
    let calls = 0
    const scope = effectScope()
    const s = scope.run(() =>
      useAttemptSubmission({
        send: async () => {
          calls++
          throw Object.assign(new Error('Give either an assignmentId or a scenarioId'), { status: 400 })
        },
        delayMs: () => 1,
      }),
    )!
    await s.submit(body)
    expect(calls).toBe(1)
    expect(s.status.value).toBe('refused')
    expect(s.lastError.value).toMatch(/scenarioId/)
    scope.stop()
  })

  it('treats timeouts and rate limits as worth retrying', () => {
    expect(isRetryable({ status: 408 })).toBe(true)
    expect(isRetryable({ status: 429 })).toBe(true)
    expect(isRetryable({ status: 422 })).toBe(false)
  })
})
