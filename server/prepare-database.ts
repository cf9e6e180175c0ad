// What start-up puts into the database after the migrations, under the start-up lock (so instances starting
// together do it once): the shipped scenarios (the library, in every deployment), the invented demo centre
// only when DEMO=true and the database is empty, and the first admin from ADMIN_EMAIL … if none exists.
import type { DataSource } from 'typeorm'
import type { AppConfig } from './config'
import { demoSignInTable } from './demo/demo-accounts'
import { hasDemoAccounts, isDatabaseEmpty, seedDemo } from './demo/seed'
import type { Logger } from './infrastructure/logging'
import { SCENARIOS_DIR } from './infrastructure/paths'
import type { PasswordHasher } from './infrastructure/security/passwords'
import { importShippedScenarios } from './scenarios/scenarios.service'
import { ensureFirstAdmin, FIRST_ADMIN_HELP, hasActiveAdmin } from './users/first-admin.service'

// The path is worked out once for source and bundle alike (infrastructure/paths.ts).
export { SCENARIOS_DIR }

export interface PrepareOptions {
  config: Pick<AppConfig, 'demo' | 'firstAdmin'>
  passwords: PasswordHasher
  log: Logger
  scenariosDir?: string
}

export async function prepareDatabase(
  ds: DataSource,
  { config, passwords, log, scenariosDir }: PrepareOptions,
) {
  const shipped = await importShippedScenarios(ds, scenariosDir ?? SCENARIOS_DIR)
  if (shipped.added) log.info({ added: shipped.added }, 'shipped scenarios imported')
  for (const skip of shipped.skipped) log.warn(skip, 'shipped scenario skipped')
  // The published demo accounts only when asked for (DEMO=true: npm start, npm run dev), never by default.
  if (config.demo && (await isDatabaseEmpty(ds))) await seedDemo(ds, passwords, log)
  await ensureFirstAdmin(ds, passwords, config.firstAdmin, log)
}

/** What the start-up banner adds: the demo sign-ins, or how to create the first admin. */
export async function startupNotices(ds: DataSource, config: Pick<AppConfig, 'demo'>): Promise<string[]> {
  const notices: string[] = []
  if (await hasDemoAccounts(ds)) {
    notices.push(demoSignInTable())
    if (!config.demo) {
      notices.push('Warning: this database holds the demo accounts, whose password is published.')
    }
  }
  if (!(await hasActiveAdmin(ds))) notices.push(FIRST_ADMIN_HELP)
  return notices
}
