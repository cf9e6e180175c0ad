// A fresh app per test file: temporary data folder and database (migrated, shipped scenarios loaded),
// the background jobs with the embedded SMTP outbox on a random loopback port (jobs run when a test asks,
// through `api.mail()` or `api.jobs.worker.runDue()`), and helpers to create users and sign in.
// With TEST_DATABASE_URL set, each app gets its own new PostgreSQL database on that server instead.
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { Express } from 'express'
import { pino, type Logger } from 'pino'
import supertest from 'supertest'
import type { DataSource } from 'typeorm'
import type { Role } from '../../shared/api/auth'
import { createApp, type AppDeps } from '../../server/app'
import {
  DEFAULT_RATE_LIMITS,
  loadConfig,
  type AppConfig,
  type PasswordHashing,
  type RateLimits,
} from '../../server/config'
import { dataSourceOptionsFor, openDatabase } from '../../server/infrastructure/database/data-source'
import { MailMessageEntity, UserEntity, type MailMessageRow, type UserRow } from '../../server/entities'
import { SCENARIOS_DIR } from '../../server/prepare-database'
import { startBackgroundJobs, type BackgroundJobs } from '../../server/background-jobs'
import { createGradingPool, type GradingPool } from '../../server/infrastructure/grading/grading-pool'
import { createLifecycle, type Lifecycle } from '../../server/infrastructure/http/lifecycle'
import { createMetrics } from '../../server/infrastructure/metrics'
import type { OutboxSmtp } from '../../server/infrastructure/mail/outbox-smtp'
import { createPasswordHasher, type PasswordHasher } from '../../server/infrastructure/security/passwords'
import { createLiveHub, type LiveHub, type LiveHubOptions } from '../../server/live/live-hub'
import { importShippedScenarios } from '../../server/scenarios/scenarios.service'
import { createTestDatabase } from './test-database'

/**
 * Cheaper argon2id cost for tests only (1 MiB, 1 pass), passed explicitly; production always
 * uses the OWASP parameters (server/config.ts OWASP_ARGON2ID).
 */
export const TEST_PASSWORD_HASHING: PasswordHashing = { memoryCost: 1024, timeCost: 1, parallelism: 1 }
export const TEST_PASSWORD = 'correct-horse-battery-test'
export const TEST_JWT_SECRET = 'test-secret-'.padEnd(48, 'x')

export interface TestApiOptions {
  /** Default: off, so tests are not throttled; pass limits to test throttling itself. */
  rateLimits?: RateLimits | false
  passwordHashing?: PasswordHashing
  scenarios?: boolean
  config?: Partial<AppConfig>
  /** A built client to serve (with config.serveClient). */
  clientDir?: string
  /** Default: one grading thread, closed with the app. */
  grading?: GradingPool
  /** Default: silent (TEST_LOG_LEVEL to see it). */
  log?: Logger
  /** Learning-platform timings (key-set cache, grade retries). */
  lti?: AppDeps['lti']
  /** Live classroom timings (sweep, idle and disconnected thresholds, stream heartbeat). */
  live?: LiveHubOptions
}

export interface TestUser {
  user: UserRow
  email: string
  password: string
  token: string
}

export interface TestApi {
  app: Express
  http: supertest.Agent
  dataSource: DataSource
  config: AppConfig
  /** The job worker and the embedded outbox; `jobs.worker.runDue()` runs every job due now. */
  jobs: BackgroundJobs
  grading: GradingPool
  /** Requests in flight; drain() starts a shutdown's 503s. */
  lifecycle: Lifecycle
  /** The live classroom's bus and rows. */
  live: LiveHub
  passwords: PasswordHasher
  outbox: OutboxSmtp
  dataDir: string
  /** Creates an active user directly in the database and signs them in. */
  createUser(role: Role, fields?: Partial<Pick<UserRow, 'name' | 'email'>>): Promise<TestUser>
  signIn(email: string, password: string): Promise<{ token: string; cookie: string }>
  /** Runs the due jobs (queued mail reaches the outbox), then returns every message received (oldest first). */
  mail(): Promise<MailMessageRow[]>
  close(): Promise<void>
}

export { DEFAULT_RATE_LIMITS }

export async function createTestApi(options: TestApiOptions = {}): Promise<TestApi> {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-api-test-'))
  const log = options.log ?? pino({ level: process.env.TEST_LOG_LEVEL ?? 'silent' })
  const database = await createTestDatabase(dataDir)
  const base = loadConfig({
    NODE_ENV: 'test',
    DATA_DIR: dataDir,
    DATABASE_URL: database.url,
    JWT_SECRET: TEST_JWT_SECRET,
    PUBLIC_BASE_URL: 'http://slipway.test',
  })
  const config: AppConfig = {
    ...base,
    rateLimits: options.rateLimits ?? false,
    passwordHashing: options.passwordHashing ?? TEST_PASSWORD_HASHING,
    serveClient: false,
    ...options.config,
  }
  const dataSource = await openDatabase(dataSourceOptionsFor(config))
  if (options.scenarios !== false) await importShippedScenarios(dataSource, SCENARIOS_DIR)
  const jobs = await startBackgroundJobs({ dataSource, config, log, run: false })
  const outbox = jobs.outbox!
  const passwords = createPasswordHasher(config.passwordHashing)
  // Real grading threads (the worker bundled from source, plain JavaScript), as in production.
  const metrics = createMetrics()
  const grading =
    options.grading ??
    createGradingPool({ threads: 1, queueLimit: config.gradingQueueLimit, onTask: metrics.gradingTask })
  const lifecycle = createLifecycle()
  const live = createLiveHub(dataSource, log, {
    ...options.live,
    postgresUrl: config.database.driver === 'postgres' ? config.database.url : undefined,
  })
  const app = createApp({
    live,
    dataSource,
    config,
    jwtSecret: TEST_JWT_SECRET,
    log,
    passwords,
    grading,
    lifecycle,
    metrics,
    clientDir: options.clientDir,
    lti: options.lti,
  })
  const http = supertest.agent(app)

  async function signIn(email: string, password: string) {
    const response = await supertest(app).post('/api/auth/sign-in').send({ email, password })
    if (response.status !== 200)
      throw new Error(`sign-in failed for ${email}: ${response.status} ${response.text}`)
    const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? [])[0]?.split(';')[0] ?? ''
    return { token: response.body.accessToken as string, cookie }
  }

  let counter = 0
  async function createUser(
    role: Role,
    fields: Partial<Pick<UserRow, 'name' | 'email'>> = {},
  ): Promise<TestUser> {
    counter++
    const now = new Date().toISOString()
    const user: UserRow = {
      id: randomUUID(),
      email: fields.email ?? `${role}${counter}-${randomUUID().slice(0, 6)}@slipway.test`,
      name: fields.name ?? `Test ${role} ${counter}`,
      role,
      passwordHash: await passwords.hash(TEST_PASSWORD),
      active: true,
      tokenVersion: 0,
      createdAt: now,
      updatedAt: now,
      lastSignInAt: null,
    }
    await dataSource.getRepository(UserEntity).insert(user)
    const { token } = await signIn(user.email, TEST_PASSWORD)
    return { user, email: user.email, password: TEST_PASSWORD, token }
  }

  return {
    app,
    http,
    dataSource,
    config,
    jobs,
    grading,
    lifecycle,
    live,
    passwords,
    outbox,
    dataDir,
    createUser,
    signIn,
    async mail() {
      await jobs.worker.runDue()
      return dataSource.getRepository(MailMessageEntity).find({ order: { receivedAt: 'ASC' } })
    },
    async close() {
      await grading.close()
      await live.close()
      await jobs.close()
      await dataSource.destroy()
      await database.drop()
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}

/** `Authorization` header value for a token. */
export const bearer = (token: string) => ({ Authorization: `Bearer ${token}` })
