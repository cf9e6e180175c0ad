// createApp(deps): the whole Express app (API, and the built client in production) without listening.
import { existsSync } from 'node:fs'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
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
import type { AppConfig } from './config'
import type { AppContext } from './context'
import { createGradebookCache } from './gradebook/gradebook-cache'
import { gradebookRouter } from './gradebook/gradebook.router'
import { healthRouter } from './health/health.router'
import { createGradingPool, type GradingPool } from './infrastructure/grading/grading-pool'
import { createLogger, requestLogger, type Logger } from './infrastructure/logging'
import type { Mailer } from './infrastructure/mail/mailer'
import { DatabaseRateLimitStore } from './infrastructure/rate-limit-store'
import { createPasswordHasher, type PasswordHasher } from './infrastructure/security/passwords'
import { createAccessTokens } from './infrastructure/security/tokens'
import { invitationsRouter } from './invitations/invitations.router'
import { apiNotFound, errorHandler } from './middleware/errors'
import { createLimiters } from './middleware/rate-limit'
import { scenariosRouter, scenarioVersionsRouter } from './scenarios/scenarios.router'

export interface AppDeps {
  dataSource: DataSource
  config: AppConfig
  mailer: Mailer
  jwtSecret: string
  log?: Logger
  passwords?: PasswordHasher
  /** Grades submissions (default: a pool of config.gradingThreads threads, closed with the app's owner). */
  grading?: GradingPool
  /** Where the built client lives (default dist/client). */
  clientDir?: string
}

export const DEFAULT_CLIENT_DIR = fileURLToPath(new URL('../dist/client', import.meta.url))

export function createApp(deps: AppDeps): Express {
  const log = deps.log ?? createLogger(deps.config.logLevel)
  const ctx: AppContext = {
    dataSource: deps.dataSource,
    config: deps.config,
    mailer: deps.mailer,
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
    grading: deps.grading ?? createGradingPool({ threads: deps.config.gradingThreads }),
  }
  const app = express()
  app.disable('x-powered-by')
  // Behind a reverse proxy on another host, TRUST_PROXY names it so rate limits see the client's address.
  app.set('trust proxy', deps.config.trustProxy)
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
          frameAncestors: ["'none'"],
          upgradeInsecureRequests: null,
        },
      },
    }),
  )
  app.use(requestLogger(log))
  // Only the session routes read the refresh cookie; no other request pays for parsing cookies.
  app.use('/api/auth', cookieParser())
  // Attempt logs and scenario documents are large; everything else stays small.
  app.use('/api/attempts', express.json({ limit: '2mb' }))
  app.use('/api/scenarios', express.json({ limit: '1mb' }))
  app.use('/api', express.json({ limit: '100kb' }))

  app.use('/api/health', healthRouter(ctx))
  app.use('/api/auth', authRouter(ctx))
  app.use('/api/invitations', invitationsRouter(ctx))
  app.use('/api/admin', adminRouter(ctx))
  app.use('/api/centre', centreRouter(ctx))
  app.use('/api/attention', attentionRouter(ctx))
  app.use('/api/apprentices', apprenticesRouter(ctx))
  app.use('/api/cohorts', cohortsRouter(ctx))
  app.use('/api/cohorts', gradebookRouter(ctx))
  app.use('/api/scenarios', scenariosRouter(ctx))
  app.use('/api/scenario-versions', scenarioVersionsRouter(ctx))
  app.use('/api/attempts', attemptsRouter(ctx))
  app.use('/api', assignmentsRouter(ctx))
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
