// Boots the server: config, database (migrate, then prepare-database.ts: shipped scenarios, demo if asked for,
// first admin), background jobs (mail …), HTTP, shutdown.
import type { Server } from 'node:http'
import { mkdirSync } from 'node:fs'
import { createApp } from './app'
import { startBackgroundJobs } from './background-jobs'
import { ConfigError, loadConfig } from './config'
import { dataSourceOptionsFor, openDatabase } from './infrastructure/database/data-source'
import { createGradingPool } from './infrastructure/grading/grading-pool'
import { createLogger } from './infrastructure/logging'
import { prepareDatabase, startupNotices } from './prepare-database'
import { createPasswordHasher } from './infrastructure/security/passwords'
import { loadOrCreateJwtSecret } from './infrastructure/security/secrets'
import { APP_VERSION } from './version'

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
  // Under the start-up lock, so instances starting together against one database seed once.
  const dataSource = await openDatabase(dataSourceOptionsFor(config), {
    afterMigrations: (ds) => prepareDatabase(ds, { config, passwords, log }),
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
  for (const notice of await startupNotices(dataSource, config)) console.log(notice + '\n')

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
