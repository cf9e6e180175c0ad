// A consistent SQLite copy of the database for the admin's download: SQLite's online backup API on SQLite;
// on PostgreSQL every table is read in one repeatable-read snapshot into a fresh, migrated SQLite file,
// so the download has the same shape on both (pg_dump remains the operator's full backup there).
import type { DataSource, EntitySchema } from 'typeorm'
import { isPostgres, openDatabase, sqliteHandle } from './data-source'
import { entities, RateLimitCounterEntity } from '../../entities'

/** Rows copied per statement: well under SQLite's limit on bound parameters. */
const BATCH = 200

export async function writeBackup(dataSource: DataSource, file: string): Promise<void> {
  if (!isPostgres(dataSource)) {
    await sqliteHandle(dataSource).backup(file)
    return
  }
  const copy = await openDatabase({ databasePath: file }, { backgroundCheckpoints: false })
  try {
    await dataSource.transaction('REPEATABLE READ', async (source) => {
      // `entities` lists parents before children, so foreign keys hold at every insert.
      for (const entity of entities as EntitySchema[]) {
        if (entity === (RateLimitCounterEntity as EntitySchema)) continue // throttling state, not data
        const primary = dataSource.getMetadata(entity).primaryColumns.map((c) => c.propertyName)
        const order = Object.fromEntries(primary.map((name) => [name, 'ASC' as const]))
        for (let skip = 0; ; skip += BATCH) {
          const rows = await source.getRepository(entity).find({ order, skip, take: BATCH })
          if (rows.length) await copy.getRepository(entity).insert(rows)
          if (rows.length < BATCH) break
        }
      }
    })
    // One self-contained file: no -wal/-shm beside it.
    await copy.query('PRAGMA journal_mode = DELETE')
  } finally {
    await copy.destroy()
  }
}
