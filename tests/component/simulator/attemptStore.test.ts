// The attempt kept in this browser: it survives a reload, grows by appending, and a damaged copy is set
// aside rather than lost.
import { describe, expect, it } from 'vitest'
import type { AttemptEvent } from '@shared/model/events'
import { attemptStorageKey, CHUNK_EVENTS, createAttemptStore } from '@/simulator/storage/attemptStore'
import { MemoryStorage } from './memoryStorage'

const events = (n: number, from = 0): AttemptEvent[] =>
  Array.from({ length: n }, (_, i) => ({ t: (from + i) * 10, type: i % 2 ? 'lock.applied' : 'lock.removed' }))

describe('the attempt saved in the browser', () => {
  const key = attemptStorageKey('version-1')

  it('comes back after a reload with its id and every event, across several chunks', () => {
    const storage = new MemoryStorage()
    const log = events(CHUNK_EVENTS * 2 + 7)
    const store = createAttemptStore(key, storage)
    for (let n = 1; n <= log.length; n += 13) store.append('attempt-1', log.slice(0, n))
    store.append('attempt-1', log)
    const { copy, problem } = createAttemptStore(key, storage).load()
    expect(problem).toBeNull()
    expect(copy?.attemptId).toBe('attempt-1')
    expect(copy?.events).toEqual(log)
  })

  it('appends: one more action rewrites about as much at 2,000 actions as at 20', () => {
    const cost = (before: number) => {
      const storage = new MemoryStorage()
      const store = createAttemptStore(key, storage)
      const log = events(before + 1)
      store.append('a', log.slice(0, before))
      storage.written = 0
      store.append('a', log)
      return storage.written
    }
    // The last chunk plus a small header, whatever the length (at most one full chunk).
    expect(cost(2000)).toBeLessThan(JSON.stringify(events(CHUNK_EVENTS)).length + 300)
    expect(cost(2000)).toBeLessThan(cost(20) * 40)
  })

  it('goes on after a reload where it left off, and starts afresh for another attempt', () => {
    const storage = new MemoryStorage()
    createAttemptStore(key, storage).append('a', events(250))
    const again = createAttemptStore(key, storage)
    const loaded = again.load().copy!
    again.append('a', [...loaded.events, ...events(3, 250)])
    expect(createAttemptStore(key, storage).load().copy?.events).toHaveLength(253)
    again.append('b', events(2))
    const other = createAttemptStore(key, storage).load().copy!
    expect(other.attemptId).toBe('b')
    expect(other.events).toEqual(events(2))
    // No chunk of the first attempt is left behind.
    expect(
      [...Array(storage.length).keys()].map((i) => storage.key(i)).filter((k) => k?.endsWith('.log.1')),
    ).toEqual([])
  })

  it('still reads an attempt saved in the first format (the whole log in one entry)', () => {
    const storage = new MemoryStorage()
    storage.setItem(
      key,
      JSON.stringify({ version: 1, attemptId: 'old', events: events(3), savedAt: '2026-01-01T00:00:00Z' }),
    )
    expect(createAttemptStore(key, storage).load().copy).toMatchObject({
      attemptId: 'old',
      events: events(3),
    })
  })

  it('keeps practice and assignment attempts apart', () => {
    expect(attemptStorageKey('v1')).not.toBe(attemptStorageKey('v1', 'assignment-9'))
  })

  it('sets a damaged entry aside instead of deleting it, and says so', () => {
    const storage = new MemoryStorage()
    storage.setItem(
      key,
      '{"version":1,"attemptId":"a","events":[{"t":5,"type":"power.on"},{"t":1,"type":"power.off"}]}',
    )
    const { copy, problem } = createAttemptStore(key, storage).load()
    expect(copy).toBeNull()
    expect(problem).toMatch(/could not be read/)
    expect(storage.getItem(key)).toBeNull()
    expect(storage.key(0)).toMatch(/damaged/)
  })

  it('sets aside a log whose chunks do not add up to what its header says', () => {
    const storage = new MemoryStorage()
    createAttemptStore(key, storage).append('a', events(5))
    storage.removeItem(`${key}.log.0`)
    expect(createAttemptStore(key, storage).load().problem).toMatch(/set aside/)
  })
})
