// The database rate-limit store, on whichever database the run uses (SQLite by default, PostgreSQL with
// TEST_DATABASE_URL): two data sources on one database stand for two API instances.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Options } from 'express-rate-limit'
import type { DataSource } from 'typeorm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { openDatabase, type DataSourceOptions } from '../../server/infrastructure/database/data-source'
import { DatabaseRateLimitStore } from '../../server/infrastructure/rate-limit-store'
import { createTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'

const WINDOW_MS = 60_000
const storeOn = (ds: DataSource, name: string, windowMs = WINDOW_MS) => {
  const store = new DatabaseRateLimitStore(ds, name)
  store.init({ windowMs } as Options)
  return store
}

describe(`database rate-limit store (${onPostgres ? 'PostgreSQL' : 'SQLite'})`, () => {
  let dir: string
  let db: TestDatabase
  let instanceA: DataSource
  let instanceB: DataSource

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'slipway-rate-store-'))
    db = await createTestDatabase(dir)
    const options: DataSourceOptions = onPostgres
      ? { postgresUrl: db.url }
      : { databasePath: db.url.replace(/^sqlite:/, '') }
    instanceA = await openDatabase(options)
    instanceB = await openDatabase(options)
  })
  afterAll(async () => {
    await instanceA?.destroy()
    await instanceB?.destroy()
    await db?.drop()
    rmSync(dir, { recursive: true, force: true })
  })

  it('counts the hits of one client made through two instances together', async () => {
    const onA = storeOn(instanceA, 'signIn')
    const onB = storeOn(instanceB, 'signIn')
    expect((await onA.increment('198.51.100.1')).totalHits).toBe(1)
    expect((await onB.increment('198.51.100.1')).totalHits).toBe(2)
    expect((await onA.increment('198.51.100.1')).totalHits).toBe(3)
    expect(await onB.get('198.51.100.1')).toMatchObject({ totalHits: 3 })
  })

  it('keeps separate counts per client and per limiter', async () => {
    const signIn = storeOn(instanceA, 'signIn')
    const reset = storeOn(instanceA, 'passwordReset')
    await signIn.increment('198.51.100.2')
    await signIn.increment('198.51.100.2')
    expect((await signIn.increment('198.51.100.3')).totalHits).toBe(1)
    expect((await reset.increment('198.51.100.2')).totalHits).toBe(1)
  })

  it('loses no hit when many arrive at the same moment', async () => {
    const stores = [storeOn(instanceA, 'invitations'), storeOn(instanceB, 'invitations')]
    const results = await Promise.all(
      Array.from({ length: 40 }, (_, i) => stores[i % 2]!.increment('198.51.100.4')),
    )
    // Each hit saw a distinct count: the upsert is atomic, not read-then-write.
    expect(results.map((r) => r.totalHits).sort((x, y) => x - y)).toEqual(
      Array.from({ length: 40 }, (_, i) => i + 1),
    )
  })

  it('ends the window at the reset time it reports, then counts from one again', async () => {
    const store = storeOn(instanceA, 'shortWindow', 150)
    const first = await store.increment('198.51.100.5')
    await store.increment('198.51.100.5')
    expect(first.resetTime!.getTime()).toBeGreaterThan(Date.now() - 1000)
    await new Promise((r) => setTimeout(r, first.resetTime!.getTime() - Date.now() + 20))
    expect(await store.get('198.51.100.5')).toBeUndefined()
    const next = await store.increment('198.51.100.5')
    expect(next.totalHits).toBe(1)
    expect(next.resetTime!.getTime()).toBeGreaterThan(first.resetTime!.getTime())
  })

  it('gives a hit back on decrement and forgets a client on reset', async () => {
    const store = storeOn(instanceA, 'undo')
    await store.increment('198.51.100.6')
    await store.increment('198.51.100.6')
    await store.decrement('198.51.100.6')
    expect(await store.get('198.51.100.6')).toMatchObject({ totalHits: 1 })
    await store.resetKey('198.51.100.6')
    expect(await store.get('198.51.100.6')).toBeUndefined()
  })

  it('resets every client of its own limiter only', async () => {
    const mine = storeOn(instanceA, 'mine')
    const other = storeOn(instanceB, 'other')
    await mine.increment('198.51.100.7')
    await other.increment('198.51.100.7')
    await mine.resetAll()
    expect(await mine.get('198.51.100.7')).toBeUndefined()
    expect(await other.get('198.51.100.7')).toMatchObject({ totalHits: 1 })
  })
})
