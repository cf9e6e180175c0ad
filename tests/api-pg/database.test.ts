// The database layer on PostgreSQL: the same migrations build exactly the schema the entities describe,
// undo cleanly, enforce foreign keys, and several instances may start against one database at once.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import supertest from 'supertest'
import type { DataSource } from 'typeorm'
import { healthResponseSchema } from '../../shared/api'
import { openDatabase } from '../../server/infrastructure/database/data-source'
import { ScenarioEntity } from '../../server/entities'
import { importShippedScenarios } from '../../server/scenarios/scenarios.service'
import { SCENARIOS_DIR } from '../../server/prepare-database'
import { createTestApi, type TestApi } from '../support/api-harness'
import { createPostgresTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'

describe.skipIf(!onPostgres)('database on PostgreSQL', () => {
  let db: TestDatabase
  let ds: DataSource
  beforeAll(async () => {
    db = await createPostgresTestDatabase()
    ds = await openDatabase({ postgresUrl: db.url })
  })
  afterAll(async () => {
    await ds?.destroy()
    await db?.drop()
  })

  it('uses the pg driver', () => {
    expect(ds.options.type).toBe('postgres')
  })

  it('leaves nothing for synchronize to change after the migrations (entities and migrations agree)', async () => {
    const pending = await ds.driver.createSchemaBuilder().log()
    expect(pending.upQueries.map((q) => q.query)).toEqual([])
  })

  it('refuses a row that points at nothing (foreign keys are enforced)', async () => {
    await expect(
      ds.query(
        `INSERT INTO enrollments (id, "cohortId", "userId", "createdAt") VALUES ('e1', 'no-cohort', 'no-user', '2026-01-01T00:00:00.000Z')`,
      ),
    ).rejects.toThrow(/foreign key/)
  })

  it('refuses a second attempt row with the same client id (idempotency is a constraint)', async () => {
    const constraints = (await ds.query(
      `SELECT constraint_type FROM information_schema.table_constraints
       WHERE table_name = 'attempts' AND constraint_type = 'PRIMARY KEY'`,
    )) as { constraint_type: string }[]
    expect(constraints).toHaveLength(1)
  })

  it('undoes every migration, leaving no application tables', async () => {
    const scratchDb = await createPostgresTestDatabase()
    const scratch = await openDatabase({ postgresUrl: scratchDb.url })
    try {
      while (Number((await scratch.query('SELECT COUNT(*) AS n FROM migrations'))[0].n) > 0)
        await scratch.undoLastMigration()
      const tables = (
        (await scratch.query(
          `SELECT table_name FROM information_schema.tables WHERE table_schema = 'public'`,
        )) as { table_name: string }[]
      ).map((t) => t.table_name)
      expect(tables.filter((name) => name !== 'migrations')).toEqual([])
    } finally {
      await scratch.destroy()
      await scratchDb.drop()
    }
  })

  it('lets instances that start together migrate and seed once (start-up lock)', async () => {
    const sharedDb = await createPostgresTestDatabase()
    const opened: DataSource[] = []
    try {
      const starts = Array.from({ length: 3 }, () =>
        openDatabase(
          { postgresUrl: sharedDb.url, poolMax: 2 },
          { afterMigrations: (d) => importShippedScenarios(d, SCENARIOS_DIR).then(() => undefined) },
        ),
      )
      opened.push(...(await Promise.all(starts)))
      const migrated = await opened[0]!.query('SELECT name FROM migrations')
      expect(migrated.length).toBe(opened[0]!.migrations.length)
      // Each shipped scenario once, at version 1, however many instances imported.
      const versions = await opened[0]!.getRepository(ScenarioEntity).find({ select: { version: true } })
      expect(versions.length).toBeGreaterThan(0)
      expect(versions.every((v) => v.version === 1)).toBe(true)
    } finally {
      for (const d of opened) await d.destroy()
      await sharedDb.drop()
    }
  })
})

describe.skipIf(!onPostgres)('health on PostgreSQL', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api?.close())

  it('reports its version and a healthy PostgreSQL database', async () => {
    const response = await supertest(api.app).get('/api/health')
    expect(response.status).toBe(200)
    const body = healthResponseSchema.parse(response.body)
    expect(body).toMatchObject({ status: 'ok', database: { ok: true, driver: 'postgres' } })
  })
})
