// Emptying a database for `npm run db:reset`. SQLite: the file and its journal go. PostgreSQL: every table,
// view and function of the schema in use (the current schema), which is what the migrations create, so running
// them again rebuilds exactly the app's schema; other schemas and the database itself are left alone.
import { rmSync } from 'node:fs'
import type { DataSource } from 'typeorm'

export function removeSqliteDatabase(path: string): void {
  for (const suffix of ['', '-wal', '-shm', '-journal']) rmSync(path + suffix, { force: true })
}

/** Drops the current schema's tables, views and functions (not an extension's) in one transaction. */
export async function emptyPostgresSchema(ds: DataSource): Promise<{ tables: number; functions: number }> {
  return ds.transaction(async (m) => {
    const names = async (sql: string) => ((await m.query(sql)) as { name: string }[]).map((r) => r.name)
    const views = await names(
      `SELECT format('%I', viewname) AS name FROM pg_views WHERE schemaname = current_schema()`,
    )
    const tables = await names(
      `SELECT format('%I', tablename) AS name FROM pg_tables WHERE schemaname = current_schema()`,
    )
    const functions = await names(
      `SELECT p.oid::regprocedure::text AS name FROM pg_proc p
       JOIN pg_namespace n ON n.oid = p.pronamespace
       LEFT JOIN pg_depend d ON d.objid = p.oid AND d.deptype = 'e'
       WHERE n.nspname = current_schema() AND d.objid IS NULL`,
    )
    if (views.length) await m.query(`DROP VIEW IF EXISTS ${views.join(', ')} CASCADE`)
    if (tables.length) await m.query(`DROP TABLE IF EXISTS ${tables.join(', ')} CASCADE`)
    for (const fn of functions) await m.query(`DROP FUNCTION IF EXISTS ${fn} CASCADE`)
    return { tables: tables.length, functions: functions.length }
  })
}

/** postgres://user@host:port/db without the password, to name the target in a confirmation. */
export function describePostgresUrl(url: string): string {
  const parsed = new URL(url)
  return `database "${parsed.pathname.slice(1)}" on ${parsed.hostname}:${parsed.port || 5432} as ${parsed.username}`
}
