// Whether the server can do its work. Liveness (/api/health): the version, and whether the database
// answers. Readiness (/api/ready): the database answers, every migration is applied, the grading threads
// are up, and the server is not draining for a shutdown.
import type { HealthResponse, ReadyResponse } from '@shared/api/admin'
import type { AppContext } from '../context'

async function databaseAnswers(ctx: AppContext): Promise<boolean> {
  try {
    await ctx.dataSource.query('SELECT 1')
    return true
  } catch (err) {
    ctx.log.error({ err }, 'health check: database did not answer')
    return false
  }
}

export async function checkHealth(ctx: AppContext): Promise<HealthResponse> {
  const ok = await databaseAnswers(ctx)
  return {
    status: ok ? 'ok' : 'degraded',
    version: ctx.config.version,
    database: { ok, driver: ctx.dataSource.options.type },
  }
}

export async function checkReady(ctx: AppContext): Promise<ReadyResponse> {
  const database = await databaseAnswers(ctx)
  const migrations = database && !(await ctx.dataSource.showMigrations().catch(() => true))
  const pool = ctx.grading.stats()
  const checks = {
    database: { ok: database },
    migrations: { ok: migrations },
    grading: { ok: pool.threadsUp >= pool.threads, threads: pool.threads, threadsUp: pool.threadsUp },
    accepting: { ok: !ctx.lifecycle.draining },
  }
  return { ready: Object.values(checks).every((c) => c.ok), checks }
}
