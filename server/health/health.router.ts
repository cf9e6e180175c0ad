// GET /api/health: version and whether the database answers (503 when it does not).
import { Router } from 'express'
import type { AppContext } from '../context'
import { checkHealth } from './health.service'

export function healthRouter(ctx: AppContext): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    const health = await checkHealth(ctx)
    res.status(health.database.ok ? 200 : 503).json(health)
  })
  return router
}
