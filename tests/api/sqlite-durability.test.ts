// Durable commits on SQLite off the event loop (server/infrastructure/database/sqlite-durability.ts): a commit
// is reported only after the write-ahead log is synced to disk, commits waiting together share one sync,
// reads never wait for one, and checkpoints run in their own thread.
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync, statSync } from 'node:fs'
import type { FileHandle } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import type { DataSource } from 'typeorm'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { AuditEntryEntity } from '../../server/entities'
import { openDatabase } from '../../server/infrastructure/database/data-source'
import { createWalSync } from '../../server/infrastructure/database/sqlite-durability'
import { serializeSqliteTransactions } from '../../server/infrastructure/database/sqlite-transactions'

const auditRow = (reason: string) => ({
  id: randomUUID(),
  actorId: null,
  action: 'test.entry',
  entityType: 'test',
  entityId: randomUUID(),
  fromValue: null,
  toValue: '{}',
  reason,
  createdAt: new Date().toISOString(),
})

/** Waits until `condition` holds (the real WAL sync of the wrapped connection takes its own time). */
async function until(condition: () => boolean) {
  for (let i = 0; i < 200 && !condition(); i++) await new Promise((r) => setTimeout(r, 10))
  expect(condition()).toBe(true)
}

/** A stand-in for the WAL sync that the test releases by hand, counting the syncs asked for. */
function heldSync() {
  const pending: (() => void)[] = []
  return {
    pending,
    durable: () => new Promise<void>((resolve) => pending.push(resolve)),
    releaseAll: () => pending.splice(0).forEach((release) => release()),
  }
}

describe('durable commits on SQLite', () => {
  const dir = mkdtempSync(join(tmpdir(), 'slipway-durability-'))
  let ds: DataSource

  beforeAll(async () => {
    // Migrated by openDatabase, then the sync swapped for one the test holds.
    const opened = await openDatabase({ databasePath: join(dir, 'migrated.sqlite') })
    await opened.destroy()
    ds = await openDatabase({ databasePath: join(dir, 'migrated.sqlite') }, { backgroundCheckpoints: false })
  })
  afterAll(async () => {
    await ds.destroy()
    rmSync(dir, { recursive: true, force: true })
  })

  it('runs NORMAL on the connection, the WAL sync doing what FULL would (sqlite.org, PRAGMA synchronous)', async () => {
    // 0 OFF, 1 NORMAL, 2 FULL. FULL in WAL mode = "the WAL file is synchronized after each transaction commit":
    // openDatabase syncs it before reporting each commit, off the event loop.
    expect(await ds.query('PRAGMA synchronous')).toEqual([{ synchronous: 1 }])
    expect(await ds.query('PRAGMA journal_mode')).toEqual([{ journal_mode: 'wal' }])
  })

  it('reports a transaction only once its commit is synced, letting the next transaction in meanwhile', async () => {
    const scratch = await openDatabase(
      { databasePath: join(dir, 'held.sqlite') },
      { backgroundCheckpoints: false },
    )
    const sync = heldSync()
    // A second wrapper over the first: its sync is the one held here.
    serializeSqliteTransactions(scratch, sync.durable)
    try {
      let firstDone = false
      const first = scratch
        .transaction((m) => m.getRepository(AuditEntryEntity).insert(auditRow('first')))
        .then(() => (firstDone = true))
      await until(() => sync.pending.length === 1)
      expect(firstDone).toBe(false)
      // The first transaction's lock is gone: a second commits while the first waits for its sync.
      const second = scratch.transaction((m) => m.getRepository(AuditEntryEntity).insert(auditRow('second')))
      await until(() => sync.pending.length === 2)
      expect(firstDone).toBe(false)
      sync.releaseAll()
      await Promise.all([first, second])
      expect(firstDone).toBe(true)
    } finally {
      sync.releaseAll()
      await scratch.destroy()
    }
  })

  it('syncs a write made outside a transaction before it returns, and never a read', async () => {
    const scratch = await openDatabase(
      { databasePath: join(dir, 'plain.sqlite') },
      { backgroundCheckpoints: false },
    )
    const sync = heldSync()
    serializeSqliteTransactions(scratch, sync.durable)
    try {
      await scratch.query('SELECT 1')
      // A transaction that only reads has nothing to make durable.
      await scratch.transaction((m) => m.getRepository(AuditEntryEntity).count())
      expect(sync.pending.length).toBe(0)
      let inserted = false
      const insert = scratch
        .getRepository(AuditEntryEntity)
        .insert(auditRow('plain'))
        .then(() => (inserted = true))
      await until(() => sync.pending.length >= 1)
      expect(inserted).toBe(false)
      sync.releaseAll()
      await insert
      expect(inserted).toBe(true)
    } finally {
      sync.releaseAll()
      await scratch.destroy()
    }
  })

  it('lets commits that wait together share one sync of the log', async () => {
    const path = join(dir, 'group.sqlite')
    const db = new Database(path)
    db.pragma('journal_mode = WAL')
    db.exec('CREATE TABLE t (x)')
    const syncs: (() => void)[] = []
    let calls = 0
    const wal = createWalSync(`${path}-wal`, (_file: FileHandle) => {
      calls++
      return new Promise((r) => syncs.push(r))
    })
    try {
      const first = wal.committed()
      await until(() => syncs.length === 1)
      // Nine more commits arrive while the first sync runs: one more sync covers them all.
      const later = Array.from({ length: 9 }, () => wal.committed())
      syncs.shift()!()
      await first
      await until(() => syncs.length === 1)
      syncs.shift()!()
      await Promise.all(later)
      expect(calls).toBe(2)
    } finally {
      syncs.splice(0).forEach((release) => release())
      await wal.close()
      db.close()
    }
  })

  it('checkpoints the log in its own thread, so the WAL does not grow without bound', async () => {
    const path = join(dir, 'checkpointed.sqlite')
    const cp = await openDatabase({ databasePath: path })
    try {
      const big = 'x'.repeat(200_000)
      for (let i = 0; i < 60; i++) {
        await cp.getRepository(AuditEntryEntity).insert({ ...auditRow('big'), toValue: big })
      }
      // 60 × 200 KB = 12 MB written; with checkpoints the log is reused instead of growing past that.
      // The checkpoint thread works in the background: on a busy machine (two test files at a time on two
      // cores) it may still be at work, so ask again for up to 15 s rather than once after a fixed wait.
      await expect
        .poll(
          async () => {
            await cp.getRepository(AuditEntryEntity).insert(auditRow('after the checkpoint'))
            const [{ busy, log, checkpointed }] = await cp.query('PRAGMA wal_checkpoint(PASSIVE)')
            return { busy, complete: checkpointed === log }
          },
          { timeout: 15_000, interval: 300 },
        )
        .toEqual({ busy: 0, complete: true })
      // The server's own connection never checkpointed automatically (its threshold is 10,000 pages)…
      expect(await cp.query('PRAGMA wal_autocheckpoint')).toEqual([{ wal_autocheckpoint: 10000 }])
      // …and the database file holds the rows.
      expect(statSync(path).size).toBeGreaterThan(60 * 200_000)
    } finally {
      await cp.destroy()
    }
  })
})
