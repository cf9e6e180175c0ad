// Throwaway databases for tests: a temporary SQLite file by default, or, when TEST_DATABASE_URL names a
// PostgreSQL server, a fresh database created on it for each caller and dropped afterwards.
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import pg from 'pg'
import type { DataSource } from 'typeorm'

/** The PostgreSQL server to test against (any database on it the user may connect to), if any. */
export const TEST_DATABASE_URL = process.env.TEST_DATABASE_URL?.trim() || undefined
export const onPostgres = TEST_DATABASE_URL !== undefined

export interface TestDatabase {
  /** The DATABASE_URL an app would be given. */
  url: string
  drop(): Promise<void>
}

async function withAdmin<T>(adminUrl: string, work: (client: pg.Client) => Promise<T>): Promise<T> {
  const client = new pg.Client({ connectionString: adminUrl })
  await client.connect()
  try {
    return await work(client)
  } finally {
    await client.end()
  }
}

/** A new, empty PostgreSQL database on the TEST_DATABASE_URL server (its user needs CREATEDB). */
export async function createPostgresTestDatabase(adminUrl = TEST_DATABASE_URL): Promise<TestDatabase> {
  if (!adminUrl) throw new Error('TEST_DATABASE_URL is not set')
  // A-z and digits only, so the name needs no quoting rules beyond the double quotes.
  const name = `slipway_test_${randomBytes(6).toString('hex')}`
  await withAdmin(adminUrl, (client) => client.query(`CREATE DATABASE "${name}"`))
  const url = new URL(adminUrl)
  url.pathname = `/${name}`
  return {
    url: url.toString(),
    async drop() {
      // WITH (FORCE) (PostgreSQL 13+) ends connections a failed test may have left open.
      await withAdmin(adminUrl, (client) => client.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`))
    },
  }
}

/** The database for one test app: on PostgreSQL a fresh database; else an SQLite file in dataDir. */
export async function createTestDatabase(dataDir: string): Promise<TestDatabase> {
  if (onPostgres) return createPostgresTestDatabase()
  return { url: `sqlite:${join(dataDir, 'slipway.sqlite')}`, drop: async () => {} }
}

/**
 * Every table's rows (migrations bookkeeping included), each table ordered by its primary key: a snapshot
 * that means the same on SQLite and PostgreSQL, for tests that prove a request changed nothing.
 */
export async function snapshotTables(dataSource: DataSource): Promise<{ table: string; rows: unknown[] }[]> {
  const runner = dataSource.createQueryRunner()
  try {
    const names = (
      (await runner.query(
        dataSource.options.type === 'postgres'
          ? `SELECT table_name AS name FROM information_schema.tables
             WHERE table_schema = current_schema() AND table_type = 'BASE TABLE'`
          : `SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'`,
      )) as { name: string }[]
    ).map((t) => t.name)
    const tables = (await runner.getTables(names)).sort((x, y) => x.name.localeCompare(y.name))
    const snapshot: { table: string; rows: unknown[] }[] = []
    for (const table of tables) {
      const order = table.primaryColumns.map((c) => `"${c.name}"`).join(', ') || '1'
      const rows = (await runner.query(`SELECT * FROM "${table.name}" ORDER BY ${order}`)) as unknown[]
      snapshot.push({ table: table.name, rows })
    }
    return snapshot
  } finally {
    await runner.release()
  }
}
