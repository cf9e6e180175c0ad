// The TypeORM DataSource: SQLite through better-sqlite3, WAL, foreign keys, busy timeout, explicit migrations.
import { mkdirSync } from 'node:fs'
import { dirname } from 'node:path'
import { DataSource } from 'typeorm'
import { entities } from './entities'
import { migrations } from './migrations'

export interface DataSourceOptions {
  /** A file path, or ':memory:' for throwaway databases. */
  databasePath: string
}

export function createDataSource({ databasePath }: DataSourceOptions): DataSource {
  const inMemory = databasePath === ':memory:'
  if (!inMemory) mkdirSync(dirname(databasePath), { recursive: true })
  return new DataSource({
    type: 'better-sqlite3',
    database: databasePath,
    entities,
    migrations,
    migrationsRun: false,
    synchronize: false,
    enableWAL: !inMemory,
    // Wait for a writer instead of failing at once; the driver also switches foreign keys on.
    timeout: 5000,
    prepareDatabase: (db: { pragma: (source: string) => unknown }) => {
      db.pragma('busy_timeout = 5000')
      db.pragma('foreign_keys = ON')
    },
  })
}

/** Opens the database and brings its schema up to date. */
export async function openDatabase(options: DataSourceOptions): Promise<DataSource> {
  const dataSource = createDataSource(options)
  await dataSource.initialize()
  await dataSource.runMigrations({ transaction: 'each' })
  return dataSource
}

/** The raw better-sqlite3 handle, for the online backup API. */
export function sqliteHandle(dataSource: DataSource): { backup(path: string): Promise<unknown> } {
  return (dataSource.driver as unknown as { databaseConnection: { backup(path: string): Promise<unknown> } })
    .databaseConnection
}
