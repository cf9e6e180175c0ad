// Boots the server: config, database (migrate, shipped scenarios, demo seed if asked for and empty, first admin),
// background jobs (mail …), HTTP, shutdown.
import type { Server } from 'node:http'
import { mkdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { createApp } from './app'
import { startBackgroundJobs } from './background-jobs'
import { ConfigError, loadConfig } from './config'
import { demoSignInTable } from './demo/demo-accounts'
import { hasDemoAccounts, isDatabaseEmpty, seedDemo } from './demo/seed'
import { dataSourceOptionsFor, openDatabase } from './infrastructure/database/data-source'
import { createGradingPool } from './infrastructure/grading/grading-pool'
import { createLogger } from './infrastructure/logging'
import { createPasswordHasher } from './infrastructure/security/passwords'
import { loadOrCreateJwtSecret } from './infrastructure/security/secrets'
import { importShippedScenarios } from './scenarios/scenarios.service'
import { ensureFirstAdmin, FIRST_ADMIN_HELP, hasActiveAdmin } from './users/first-admin.service'
import { APP_VERSION } from './version'

export const SCENARIOS_DIR = fileURLToPath(new URL('../scenarios', import.meta.url))

export interface StartOptions {
  mode?: 'api' | 'app'
  env?: NodeJS.ProcessEnv
}

export async function startServer({ mode = 'api', env = process.env }: StartOptions = {}) {
  let config
  try {
    config = loadConfig(env, { mode, version: APP_VERSION })
  } catch (error) {
    if (error instanceof ConfigError) {
      console.error(error.message)
      process.exit(2)
    }
    throw error
  }
  const log = createLogger(config.logLevel)
  mkdirSync(config.dataDir, { recursive: true })
  const jwtSecret = loadOrCreateJwtSecret(config.dataDir, config.jwtSecret)
  const passwords = createPasswordHasher(config.passwordHashing)
  // Seeding runs under the start-up lock, so instances starting together against one database seed once.
  const dataSource = await openDatabase(dataSourceOptionsFor(config), {
    async afterMigrations(ds) {
      const shipped = await importShippedScenarios(ds, SCENARIOS_DIR)
      if (shipped.added) log.info({ added: shipped.added }, 'shipped scenarios imported')
      for (const skip of shipped.skipped) log.warn(skip, 'shipped scenario skipped')
      // The published demo accounts only when asked for (DEMO=true: npm start, npm run dev), never by default.
      if (config.demo && (await isDatabaseEmpty(ds))) await seedDemo(ds, passwords, log)
      await ensureFirstAdmin(ds, passwords, config.firstAdmin, log)
    },
  })

  const jobs = await startBackgroundJobs({ dataSource, config, log })
  const grading = createGradingPool({ threads: config.gradingThreads })
  const app = createApp({ dataSource, config, jwtSecret, log, passwords, grading })

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s))
    s.once('error', reject)
  })
  const url = config.serveClient ? config.publicBaseUrl : `http://localhost:${config.port}`
  console.log(`\nSlipway ${APP_VERSION} listening on ${url}${config.serveClient ? '' : ' (API only)'}`)
  if (await hasDemoAccounts(dataSource)) {
    console.log(demoSignInTable() + '\n')
    if (!config.demo) log.warn('this database holds the demo accounts, whose password is published')
  }
  if (!(await hasActiveAdmin(dataSource))) {
    console.log(`\n${FIRST_ADMIN_HELP}\n`)
    log.warn('no admin account exists yet (how to create one is printed above and in the README)')
  }

  let stopping = false
  async function stop(signal: string) {
    if (stopping) return
    stopping = true
    log.info({ signal }, 'shutting down')
    const force = setTimeout(() => process.exit(1), 10_000).unref()
    await new Promise<void>((resolve) => server.close(() => resolve()))
    server.closeAllConnections?.()
    await jobs.close(3000)
    await grading.close()
    await dataSource.destroy()
    clearTimeout(force)
    process.exit(0)
  }
  process.once('SIGTERM', () => void stop('SIGTERM'))
  process.once('SIGINT', () => void stop('SIGINT'))
  return { server, config, dataSource, jobs }
}
