// GET /api/health: version and whether the database answers.
import { Router } from 'express'
import type { HealthResponse } from '@shared/api/admin'
import type { AppContext } from '../context'

export function healthRouter(ctx: AppContext): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    let ok = false
    try {
      await ctx.dataSource.query('SELECT 1')
      ok = true
    } catch (err) {
      ctx.log.error({ err }, 'health check: database did not answer')
    }
    const body: HealthResponse = {
      status: ok ? 'ok' : 'degraded',
      version: ctx.config.version,
      database: { ok, driver: ctx.dataSource.options.type },
    }
    res.status(ok ? 200 : 503).json(body)
  })
  return router
}
