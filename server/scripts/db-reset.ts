// `npm run db:reset`: delete the database and recreate it with the demo seed.
import { rmSync } from 'node:fs'
import { loadConfig } from '../config'
import { demoSignInTable } from '../demo/demo-accounts'
import { seedDemo } from '../demo/seed'
import { openDatabase } from '../infrastructure/database/data-source'
import { createLogger } from '../infrastructure/logging'
import { createPasswordHasher } from '../infrastructure/security/passwords'
import { SCENARIOS_DIR } from '../main'
import { importShippedScenarios } from '../scenarios/scenarios.service'

const config = loadConfig(process.env)
const log = createLogger(config.logLevel)
for (const suffix of ['', '-wal', '-shm', '-journal']) rmSync(config.databasePath + suffix, { force: true })
const dataSource = await openDatabase({ databasePath: config.databasePath })
await importShippedScenarios(dataSource, SCENARIOS_DIR)
await seedDemo(dataSource, createPasswordHasher(config.passwordHashing), log)
await dataSource.destroy()
console.log(`Database recreated at ${config.databasePath}\n${demoSignInTable()}`)
