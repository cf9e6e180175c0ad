// `npm run db:reset`: the database from scratch, migrated, with the shipped scenarios and the demo centre.
// SQLite: the file in DATA_DIR is deleted. PostgreSQL (DATABASE_URL): the app's tables and functions are
// dropped — only with `-- --yes`, since that database may be a shared one; stop every instance first.
import { loadConfig } from '../config'
import { demoSignInTable } from '../demo/demo-accounts'
import { createDataSource, dataSourceOptionsFor, openDatabase } from '../infrastructure/database/data-source'
import {
  describePostgresUrl,
  emptyPostgresSchema,
  removeSqliteDatabase,
} from '../infrastructure/database/reset'
import { createLogger } from '../infrastructure/logging'
import { createPasswordHasher } from '../infrastructure/security/passwords'
import { prepareDatabase } from '../prepare-database'

const config = loadConfig(process.env)
const log = createLogger(config.logLevel)
const options = dataSourceOptionsFor(config)
let where: string
if (config.database.driver === 'postgres') {
  where = describePostgresUrl(config.database.url)
  if (!process.argv.includes('--yes')) {
    console.error(
      `This deletes every table of ${where} (all accounts, cohorts and attempts), then seeds the demo.\n` +
        'Stop every Slipway instance using it, then run: npm run db:reset -- --yes',
    )
    process.exit(1)
  }
  const existing = createDataSource(options)
  await existing.initialize()
  await emptyPostgresSchema(existing)
  await existing.destroy()
} else {
  where = config.databasePath
  removeSqliteDatabase(config.databasePath)
}
const passwords = createPasswordHasher(config.passwordHashing)
const dataSource = await openDatabase(options, {
  afterMigrations: (ds) => prepareDatabase(ds, { config: { demo: true }, passwords, log }),
})
await dataSource.destroy()
console.log(`Database recreated: ${where}\n${demoSignInTable()}`)
