// `npm run db:reset` on the configured database: SQLite's file is recreated; PostgreSQL's tables are dropped
// and rebuilt only when the operator confirms with --yes.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { UserEntity } from '../../server/entities'
import { createDataSource, openDatabase } from '../../server/infrastructure/database/data-source'
import { createPasswordHasher } from '../../server/infrastructure/security/passwords'
import { createAdminAccount } from '../../server/users/first-admin.service'
import { TEST_JWT_SECRET, TEST_PASSWORD_HASHING } from '../support/api-harness'
import { runScript } from '../support/server-process'
import { createTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'

describe('npm run db:reset', () => {
  let dataDir: string
  let db: TestDatabase
  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'slipway-db-reset-'))
    db = await createTestDatabase(dataDir)
  })
  afterAll(async () => {
    await db.drop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  const options = () =>
    onPostgres ? { postgresUrl: db.url } : { databasePath: join(dataDir, 'slipway.sqlite') }

  const reset = (args: string[] = []) =>
    runScript('server/scripts/db-reset.ts', args, {
      env: { DATA_DIR: dataDir, DATABASE_URL: db.url, JWT_SECRET: TEST_JWT_SECRET },
    })

  async function emails(): Promise<string[]> {
    const ds = createDataSource(options())
    await ds.initialize()
    try {
      return (await ds.getRepository(UserEntity).find({ order: { email: 'ASC' } })).map((u) => u.email)
    } finally {
      await ds.destroy()
    }
  }

  it('replaces whatever the database held with the demo centre (on PostgreSQL only once confirmed)', async () => {
    const ds = await openDatabase(options())
    await createAdminAccount(
      ds,
      createPasswordHasher(TEST_PASSWORD_HASHING),
      { email: 'real.admin@slipway.test', name: 'Real Admin', password: 'a long real admin phrase' },
      'test',
    )
    await ds.destroy()

    if (onPostgres) {
      const refused = await reset()
      expect(refused.code).toBe(1)
      expect(refused.out).toMatch(/This deletes every table of database "slipway_test_\w+" on 127\.0\.0\.1/)
      expect(refused.out).toContain('npm run db:reset -- --yes')
      expect(await emails()).toEqual(['real.admin@slipway.test'])
    }

    const done = await reset(['--yes'])
    expect(done.out).toContain('Database recreated')
    expect(done.code).toBe(0)
    expect(await emails()).toEqual(DEMO_ACCOUNTS.map((a) => a.email).sort())
  }, 120_000)
})
