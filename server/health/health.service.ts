// Whether the server can do its work: the version, and whether the database answers.
import type { HealthResponse } from '@shared/api/admin'
import type { AppContext } from '../context'

export async function checkHealth(ctx: AppContext): Promise<HealthResponse> {
  let ok = false
  try {
    await ctx.dataSource.query('SELECT 1')
    ok = true
  } catch (err) {
    ctx.log.error({ err }, 'health check: database did not answer')
  }
  return {
    status: ok ? 'ok' : 'degraded',
    version: ctx.config.version,
    database: { ok, driver: ctx.dataSource.options.type },
  }
}
