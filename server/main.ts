// Boots the server: config, database (migrate, then prepare-database.ts: shipped scenarios, demo if asked for,
// first admin), background jobs (mail …), grading threads, HTTP; on SIGTERM drains the requests in flight (new
// ones get 503) before it closes everything.
import type { Server } from 'node:http'
import { mkdirSync } from 'node:fs'
import { createApp } from './app'
import { startBackgroundJobs } from './background-jobs'
import { ConfigError, loadConfig, type AppConfig } from './config'
import { dataSourceOptionsFor, openDatabase } from './infrastructure/database/data-source'
import { createGradingPool } from './infrastructure/grading/grading-pool'
import { createLifecycle } from './infrastructure/http/lifecycle'
import { createMetrics } from './infrastructure/metrics'
import { createLogger } from './infrastructure/logging'
import { createLiveHub } from './live/live-hub'
import { prepareDatabase, startupNotices } from './prepare-database'
import { createPasswordHasher } from './infrastructure/security/passwords'
import { SCENARIOS_DIR } from './infrastructure/paths'
import { loadOrCreateJwtSecret } from './infrastructure/security/secrets'
import { APP_VERSION } from './version'

export { SCENARIOS_DIR }

export interface StartOptions {
  mode?: 'api' | 'app'
  env?: NodeJS.ProcessEnv
}

export async function startServer({ mode = 'api', env = process.env }: StartOptions = {}) {
  let config: AppConfig
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
  const metrics = createMetrics()
  metrics.watchQueues(async () =>
    Object.entries(await jobs.figures()).map(([queue, figures]) => ({
      queue,
      depth: figures.queue.due + figures.queue.waiting + figures.queue.running,
      failed: figures.queue.failed,
    })),
  )
  const grading = createGradingPool({
    threads: config.gradingThreads,
    queueLimit: config.gradingQueueLimit,
    onTask: metrics.gradingTask,
  })
  // Listen only once the threads answer, so the first submissions do not wait for them to load.
  await grading.warm()
  const lifecycle = createLifecycle()
  const live = createLiveHub(dataSource, log, {
    postgresUrl: config.database.driver === 'postgres' ? config.database.url : undefined,
  })
  const app = createApp({ dataSource, config, jwtSecret, log, passwords, grading, metrics, lifecycle, live })

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
    log.info(
      { signal, inFlight: lifecycle.inFlight },
      'draining: new requests get 503 until those in flight finish',
    )
    const force = setTimeout(() => process.exit(1), config.shutdownTimeoutMs + 10_000).unref()
    // In-flight submissions finish (graded, stored, acknowledged); /api/ready says 503 meanwhile.
    const drained = await lifecycle.drain(config.shutdownTimeoutMs)
    if (!drained)
      log.warn({ inFlight: lifecycle.inFlight }, 'shutdown timeout: closing with requests in flight')
    // A moment more of 503s: a client just acknowledged that sends again learns to wait (Retry-After)
    // instead of finding its new connection cut by the listener closing.
    await new Promise((resolve) => setTimeout(resolve, 250))
    const closed = new Promise<void>((resolve) => server.close(() => resolve()))
    await Promise.race([closed, new Promise((resolve) => setTimeout(resolve, 2000))])
    server.closeAllConnections()
    // Queued mail lives in the database: what is not sent now is sent by the next start.
    await jobs.close(3000)
    await grading.close()
    await live.close()
    await dataSource.destroy()
    clearTimeout(force)
    process.exit(0)
  }
  process.once('SIGTERM', () => void stop('SIGTERM'))
  process.once('SIGINT', () => void stop('SIGINT'))
  return { server, config, dataSource, jobs }
}
