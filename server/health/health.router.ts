// GET /api/health (liveness: 503 when the database does not answer), /api/ready (readiness: 503 while
// starting, draining or missing a part) and /api/metrics (Prometheus text; see metrics-access.ts).
import { Router } from 'express'
import type { AppContext } from '../context'
import { HttpError } from '../http-error'
import { checkHealth, checkReady } from './health.service'
import { mayReadMetrics } from './metrics-access'

export function healthRouter(ctx: AppContext): Router {
  const router = Router()
  router.get('/health', async (_req, res) => {
    const health = await checkHealth(ctx)
    res.status(health.database.ok ? 200 : 503).json(health)
  })

  router.get('/ready', async (_req, res) => {
    const ready = await checkReady(ctx)
    res.status(ready.ready ? 200 : 503).json(ready)
  })

  router.get('/metrics', async (req, res) => {
    if (!mayReadMetrics(req, ctx.config.metricsToken)) {
      throw new HttpError(
        403,
        'forbidden',
        ctx.config.metricsToken
          ? 'Metrics need the metrics token'
          : 'Metrics are served only to this machine without a proxy (or set METRICS_TOKEN)',
      )
    }
    res.type(ctx.metrics.registry.contentType).send(await ctx.metrics.registry.metrics())
  })
  return router
}
