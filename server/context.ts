// What every route needs, built once per app: database, settings, hashing and tokens (mail is a queued job).
import type { DataSource } from 'typeorm'
import type { Logger } from './infrastructure/logging'
import type { AppConfig } from './config'
import type { Limiters } from './middleware/rate-limit'
import type { GradebookCache } from './gradebook/gradebook-cache'
import type { GradingPool } from './infrastructure/grading/grading-pool'
import type { Lifecycle } from './infrastructure/http/lifecycle'
import type { LiveHub } from './live/live-hub'
import type { Metrics } from './infrastructure/metrics'
import type { PasswordHasher } from './infrastructure/security/passwords'
import type { AccessTokens } from './infrastructure/security/tokens'

export interface AppContext {
  dataSource: DataSource
  config: AppConfig
  passwords: PasswordHasher
  tokens: AccessTokens
  log: Logger
  limits: Limiters
  /** Cohort gradebooks kept between requests, checked against the database's revision each time. */
  gradebooks: GradebookCache
  /** Reads and grades submitted attempts in worker threads (GRADING_THREADS). */
  grading: GradingPool
  /** Prometheus metrics (/api/metrics). */
  metrics: Metrics
  /** Requests in flight, and whether the server is draining for a shutdown. */
  lifecycle: Lifecycle
  /** Live classroom: the change bus (in-process; LISTEN/NOTIFY across instances on PostgreSQL) and its rows. */
  live: LiveHub
}

/** A link into the client, from the configured public base URL. */
export const appLink = (ctx: AppContext, path: string) => `${ctx.config.publicBaseUrl}${path}`
