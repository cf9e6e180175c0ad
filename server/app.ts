// createApp(deps): the whole Express app (API, and the built client in production) without listening.
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import cookieParser from 'cookie-parser'
import express, { type Express } from 'express'
import helmet from 'helmet'
import type { DataSource } from 'typeorm'
import { adminRouter } from './admin/admin.router'
import { apprenticesRouter } from './apprentices/apprentices.router'
import { assignmentsRouter } from './assignments/assignments.router'
import { attentionRouter } from './attention/attention.router'
import { attemptsRouter } from './attempts/attempts.router'
import { authRouter } from './auth/auth.router'
import { centreRouter } from './centre/centre.router'
import { cohortsRouter } from './cohorts/cohorts.router'
import { cohortTeachingRouter } from './cohorts/teaching.router'
import type { AppConfig } from './config'
import type { AppContext } from './context'
import { createGradebookCache } from './gradebook/gradebook-cache'
import { gradebookRouter } from './gradebook/gradebook.router'
import { healthRouter } from './health/health.router'
import { createGradingPool, type GradingPool } from './infrastructure/grading/grading-pool'
import { createLifecycle, type Lifecycle } from './infrastructure/http/lifecycle'
import { requestContext } from './infrastructure/http/request-context'
import { createLogger, requestLogger, type Logger } from './infrastructure/logging'
import { createMetrics, type Metrics } from './infrastructure/metrics'
import { CLIENT_DIR } from './infrastructure/paths'
import { DatabaseRateLimitStore } from './infrastructure/rate-limit-store'
import { createPasswordHasher, type PasswordHasher } from './infrastructure/security/passwords'
import { createAccessTokens } from './infrastructure/security/tokens'
import { invitationsRouter } from './invitations/invitations.router'
import { framingFor } from './lti/framing'
import { createLiveHub, type LiveHub } from './live/live-hub'
import { liveRouter } from './live/live.router'
import { ltiRouter } from './lti/lti.router'
import type { LtiOptions } from './lti/runtime'
import { apiNotFound, errorHandler } from './middleware/errors'
import { createLimiters } from './middleware/rate-limit'
import { recordsRouter } from './records/records.router'
import { practiceRouter } from './practice/practice.router'
import { insightRouter } from './insight/insight.router'
import { scenariosRouter, scenarioVersionsRouter } from './scenarios/scenarios.router'

export interface AppDeps {
  dataSource: DataSource
  config: AppConfig
  jwtSecret: string
  log?: Logger
  passwords?: PasswordHasher
  /** Reads and grades submissions (default: a pool of config.gradingThreads threads; whoever passes one closes it). */
  grading?: GradingPool
  metrics?: Metrics
  lifecycle?: Lifecycle
  /** Where the built client lives (default dist/client). */
  clientDir?: string
  /** Learning-platform (LTI) settings for tests: key-set cache and grade retry timings. */
  lti?: LtiOptions
  /** The live classroom's hub (default: one made here; whoever passes one closes it). */
  live?: LiveHub
}

export const DEFAULT_CLIENT_DIR = CLIENT_DIR

export function createApp(deps: AppDeps): Express {
  const log = deps.log ?? createLogger(deps.config.logLevel)
  const metrics = deps.metrics ?? createMetrics()
  const grading =
    deps.grading ??
    createGradingPool({
      threads: deps.config.gradingThreads,
      queueLimit: deps.config.gradingQueueLimit,
      onTask: metrics.gradingTask,
    })
  metrics.watchGradingPool(grading.stats)
  const lifecycle = deps.lifecycle ?? createLifecycle()
  const ctx: AppContext = {
    dataSource: deps.dataSource,
    config: deps.config,
    passwords: deps.passwords ?? createPasswordHasher(deps.config.passwordHashing),
    tokens: createAccessTokens(deps.jwtSecret),
    log,
    // Several instances must count together: their counters then live in the shared database.
    limits: createLimiters(
      deps.config.rateLimits,
      deps.config.rateLimitStore === 'database'
        ? (which) => new DatabaseRateLimitStore(deps.dataSource, which)
        : undefined,
    ),
    gradebooks: createGradebookCache(deps.dataSource),
    grading,
    metrics,
    lifecycle,
    live:
      deps.live ??
      createLiveHub(deps.dataSource, log, {
        postgresUrl: deps.config.database.driver === 'postgres' ? deps.config.database.url : undefined,
      }),
  }
  const app = express()
  app.disable('x-powered-by')
  // Behind a reverse proxy on another host, TRUST_PROXY names it so rate limits see the client's address.
  app.set('trust proxy', deps.config.trustProxy)
  app.use(requestContext())
  // Registered learning platforms may show Slipway's pages in a frame; nobody else may (lti/framing.ts).
  const framing = framingFor(ctx)
  app.use(framing.resolve)
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          // Vuetify sets inline styles for theme variables and positioning.
          styleSrc: ["'self'", "'unsafe-inline'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'", 'data:'],
          connectSrc: ["'self'"],
          // Pixi compiles shaders and may spin up workers from blob: URLs.
          workerSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          frameAncestors: [framing.directive],
          upgradeInsecureRequests: null,
        },
      },
    }),
  )
  app.use(framing.dropFrameOptions)
  app.use(requestLogger(log))
  app.use(metrics.httpMiddleware)
  app.use(lifecycle.middleware)
  // Only the session routes read the refresh cookie; no other request pays for parsing cookies.
  app.use('/api/auth', cookieParser())
  // Attempt logs and scenario documents are large; everything else stays small. A submitted attempt stays
  // bytes here: a grading thread parses and validates it (attempts.router.ts).
  app.post('/api/attempts', express.raw({ type: 'application/json', limit: '2mb' }))
  app.use('/api/scenarios', express.json({ limit: '1mb' }))
  app.use('/api', express.json({ limit: '100kb' }))

  app.use('/api', healthRouter(ctx))
  app.use('/api/auth', authRouter(ctx))
  app.use('/api/invitations', invitationsRouter(ctx))
  app.use('/api/admin', adminRouter(ctx))
  app.use('/api/centre', centreRouter(ctx))
  app.use('/api/attention', attentionRouter(ctx))
  app.use('/api/apprentices', apprenticesRouter(ctx))
  app.use('/api/cohorts', cohortsRouter(ctx))
  app.use('/api/cohorts', cohortTeachingRouter(ctx))
  app.use('/api/cohorts', gradebookRouter(ctx))
  app.use('/api/scenarios', scenariosRouter(ctx))
  app.use('/api/scenario-versions', scenarioVersionsRouter(ctx))
  app.use('/api/attempts', attemptsRouter(ctx))
  app.use('/api', assignmentsRouter(ctx))
  app.use('/api/lti', ltiRouter(ctx, deps.lti))
  app.use('/api/live', liveRouter(ctx))
  app.use('/api', recordsRouter(ctx))
  app.use('/api', practiceRouter(ctx))
  app.use('/api', insightRouter(ctx))
  app.use('/api', apiNotFound)

  const clientDir = deps.clientDir ?? DEFAULT_CLIENT_DIR
  if (deps.config.serveClient && existsSync(join(clientDir, 'index.html'))) {
    app.use(express.static(clientDir, { index: false, maxAge: '1h' }))
    // Hashed assets may be cached for long; index.html must always be fresh after a deploy.
    app.get(/^(?!\/api\/).*/, (req, res, next) => {
      if (req.method !== 'GET' || !req.accepts('html')) return next()
      res.setHeader('Cache-Control', 'no-cache')
      res.sendFile(join(clientDir, 'index.html'))
    })
  }

  app.use(errorHandler)
  return app
}
