// Two instances' workers on one PostgreSQL database, each with its own connection pool, claiming from the same
// queue at once (FOR UPDATE SKIP LOCKED): every job runs exactly once, and both instances do part of the work.
import { pino } from 'pino'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { z } from 'zod'
import type { DataSource } from 'typeorm'
import { JobEntity } from '../../server/entities'
import { openDatabase } from '../../server/infrastructure/database/data-source'
import { createJobWorker, defineJobKind } from '../../server/infrastructure/jobs'
import { createPostgresTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'

const log = pino({ level: 'silent' })
const JOBS = 300

describe.skipIf(!onPostgres)('the job queue shared by two instances on PostgreSQL', () => {
  let db: TestDatabase
  let first: DataSource
  let second: DataSource
  beforeAll(async () => {
    db = await createPostgresTestDatabase()
    first = await openDatabase({ postgresUrl: db.url, poolMax: 4 })
    second = await openDatabase({ postgresUrl: db.url, poolMax: 4 })
  })
  afterAll(async () => {
    await first?.destroy()
    await second?.destroy()
    await db?.drop()
  })

  it('runs each of 300 jobs once between them', async () => {
    const kind = defineJobKind({ kind: 'test.shared', payload: z.object({ n: z.number().int() }) })
    await first.transaction(async (m) => {
      for (let n = 0; n < JOBS; n++) await kind.enqueue(m, { n })
    })
    const runs: { n: number; by: string }[] = []
    const workers = [first, second].map((ds, i) => {
      const worker = createJobWorker({ dataSource: ds, log, pollMs: 20, concurrency: 4, id: `instance-${i}` })
      worker.handle(kind, async ({ n }) => {
        await new Promise((r) => setTimeout(r, 1))
        runs.push({ n, by: worker.id })
      })
      return worker
    })
    // Both polling, as deployed instances do, until the queue is empty.
    for (const worker of workers) worker.start()
    const jobs = first.getRepository(JobEntity)
    const deadline = Date.now() + 60_000
    while ((await jobs.countBy({ kind: kind.kind, status: 'done' })) < JOBS && Date.now() < deadline) {
      await new Promise((r) => setTimeout(r, 100))
    }
    await Promise.all(workers.map((w) => w.stop()))

    expect(runs.map((r) => r.n).sort((x, y) => x - y)).toEqual(Array.from({ length: JOBS }, (_, n) => n))
    expect([...new Set(runs.map((r) => r.by))].sort()).toEqual(['instance-0', 'instance-1'])
    expect(await jobs.countBy({ kind: kind.kind, status: 'done', attempts: 1 })).toBe(JOBS)
  })
})
