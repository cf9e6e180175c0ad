// Concurrent requests on the embedded SQLite database: TypeORM runs every statement through one
// connection, so without serializeSqliteTransactions two transactions awaiting at the same time collide
// ("cannot start a transaction within a transaction") or nest, and a stray statement joins whichever
// transaction is open — and is undone with it. These tests interleave work the way concurrent requests do.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DataSource } from 'typeorm'
import { AuditEntryEntity } from '../../server/entities'
import { createTestApi, type TestApi } from '../support/api-harness'

const tick = () => new Promise((resolve) => setImmediate(resolve))

function auditRow(reason: string) {
  return {
    id: randomUUID(),
    actorId: null,
    action: 'test.entry',
    entityType: 'test',
    entityId: randomUUID(),
    fromValue: null,
    toValue: '{}',
    reason,
    createdAt: new Date().toISOString(),
  }
}

describe('transactions under concurrency', () => {
  let api: TestApi
  let ds: DataSource
  const count = (reason: string) => ds.getRepository(AuditEntryEntity).countBy({ reason })

  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    ds = api.dataSource
  })
  afterAll(() => api.close())

  it('runs twenty transactions that await between their statements side by side, committing all', async () => {
    await Promise.all(
      Array.from({ length: 20 }, (_, i) =>
        ds.transaction(async (manager) => {
          await manager.getRepository(AuditEntryEntity).insert(auditRow('side by side'))
          await tick() // another request's code runs here
          await manager.getRepository(AuditEntryEntity).insert(auditRow('side by side'))
          if (i % 2) await tick()
        }),
      ),
    )
    expect(await count('side by side')).toBe(40)
  })

  it('keeps a statement made outside a transaction that rolls back meanwhile', async () => {
    let inTransaction!: () => void
    const started = new Promise<void>((resolve) => (inTransaction = resolve))
    const failing = ds.transaction(async (manager) => {
      await manager.getRepository(AuditEntryEntity).insert(auditRow('rolled back'))
      inTransaction()
      await tick()
      await tick()
      throw new Error('the transaction fails after its first statement')
    })
    await started
    // Another request writes while that transaction is open.
    const stray = ds.getRepository(AuditEntryEntity).insert(auditRow('stray write'))
    await expect(failing).rejects.toThrow('the transaction fails')
    await stray
    expect(await count('rolled back')).toBe(0)
    expect(await count('stray write')).toBe(1)
  })

  it('still nests: a transaction inside a transaction is a savepoint of its parent', async () => {
    await ds.transaction(async (outer) => {
      await outer.getRepository(AuditEntryEntity).insert(auditRow('outer'))
      await outer
        .transaction(async (inner) => {
          await inner.getRepository(AuditEntryEntity).insert(auditRow('inner'))
          throw new Error('inner fails')
        })
        .catch(() => undefined)
    })
    expect(await count('outer')).toBe(1)
    expect(await count('inner')).toBe(0)
  })
})
