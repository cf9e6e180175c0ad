// Boots the server: config, database (migrate, shipped scenarios, demo seed if empty), mail, HTTP, shutdown.
import type { Server } from 'node:http'
import { mkdirSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { createApp } from './app'
import { ConfigError, loadConfig } from './config'
import { demoSignInTable } from './demo/demo-accounts'
import { hasDemoAccounts, isDatabaseEmpty, seedDemo } from './demo/seed'
import { dataSourceOptionsFor, openDatabase } from './infrastructure/database/data-source'
import { createGradingPool } from './infrastructure/grading/grading-pool'
import { createLogger } from './infrastructure/logging'
import { createMailer, type SmtpTarget } from './infrastructure/mail/mailer'
import { startOutboxSmtp, type OutboxSmtp } from './infrastructure/mail/outbox-smtp'
import { createPasswordHasher } from './infrastructure/security/passwords'
import { loadOrCreateJwtSecret } from './infrastructure/security/secrets'
import { importShippedScenarios } from './scenarios/scenarios.service'
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
      if (await isDatabaseEmpty(ds)) await seedDemo(ds, passwords, log)
    },
  })

  let outbox: OutboxSmtp | undefined
  let target: SmtpTarget
  if (config.smtp) {
    target = { ...config.smtp, requireTls: true }
  } else {
    outbox = await startOutboxSmtp(dataSource, log)
    target = { host: outbox.host, port: outbox.port, secure: false }
    log.info({ port: outbox.port }, 'embedded SMTP outbox listening on loopback')
  }
  const mailer = createMailer({ target, from: config.mailFrom, log })
  const grading = createGradingPool({ threads: config.gradingThreads })
  const app = createApp({ dataSource, config, mailer, jwtSecret, log, passwords, grading })

  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s))
    s.once('error', reject)
  })
  const url = config.serveClient ? config.publicBaseUrl : `http://localhost:${config.port}`
  console.log(`\nSlipway ${APP_VERSION} listening on ${url}${config.serveClient ? '' : ' (API only)'}`)
  if (await hasDemoAccounts(dataSource)) console.log(demoSignInTable() + '\n')

  let stopping = false
  async function stop(signal: string) {
    if (stopping) return
    stopping = true
    log.info({ signal }, 'shutting down')
    const force = setTimeout(() => process.exit(1), 10_000).unref()
    await new Promise<void>((resolve) => server.close(() => resolve()))
    server.closeAllConnections?.()
    await Promise.race([mailer.idle(), new Promise((r) => setTimeout(r, 3000))])
    mailer.close()
    await grading.close()
    await outbox?.close()
    await dataSource.destroy()
    clearTimeout(force)
    process.exit(0)
  }
  process.once('SIGTERM', () => void stop('SIGTERM'))
  process.once('SIGINT', () => void stop('SIGINT'))
  return { server, config, dataSource }
}
