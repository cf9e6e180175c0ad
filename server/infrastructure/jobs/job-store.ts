// The queue's statements. Each change of a job's state is one conditional UPDATE, so it is atomic on both
// databases: a claim takes due jobs and leases them to one worker (PostgreSQL: FOR UPDATE SKIP LOCKED, so
// instances claiming at once take different jobs; SQLite: one writer at a time does the same), and a worker
// finishes a job only while it still holds the lease (`lockedBy`), so an instance whose lease ran out and
// was taken over cannot overwrite the new owner's result.
import { DataSource, type EntityManager } from 'typeorm'
import type { JobRow, JobStatus } from '../../entities'
import { noteEnqueued } from './wake'

interface Result {
  records: Record<string, unknown>[]
  affected: number
}

/** One statement written with `?` placeholders, run on either database. */
async function run(db: DataSource | EntityManager, sql: string, params: unknown[]): Promise<Result> {
  const manager = db instanceof DataSource ? db.manager : db
  let n = 0
  const text = manager.connection.options.type === 'postgres' ? sql.replace(/\?/g, () => `$${++n}`) : sql
  const runner = manager.queryRunner ?? manager.connection.createQueryRunner()
  try {
    const result = await runner.query(text, params, true)
    return { records: (result.records ?? []) as Record<string, unknown>[], affected: result.affected ?? 0 }
  } finally {
    if (!manager.queryRunner) await runner.release()
  }
}

const list = (values: unknown[]) => `(${values.map(() => '?').join(', ')})`

const toRow = (raw: Record<string, unknown>): JobRow => ({
  ...(raw as unknown as JobRow),
  attempts: Number(raw.attempts),
  maxAttempts: Number(raw.maxAttempts),
})

export interface ClaimRequest {
  kinds: string[]
  workerId: string
  leaseMs: number
  limit: number
  now: Date
}

/**
 * Leases up to `limit` due jobs of these kinds to `workerId`: queued ones whose time has come, and running
 * ones whose lease ran out (their instance stopped). The attempt is counted now, so a job that keeps
 * crashing its instance still runs out of attempts.
 */
export async function claimJobs(ds: DataSource, { kinds, workerId, leaseMs, limit, now }: ClaimRequest) {
  if (!kinds.length || limit < 1) return []
  const at = now.toISOString()
  await failAbandoned(ds, kinds, at)
  const skipLocked = ds.options.type === 'postgres' ? 'FOR UPDATE SKIP LOCKED' : ''
  const { records } = await run(
    ds,
    `UPDATE "jobs" SET "status" = 'running', "lockedBy" = ?, "lockedUntil" = ?,
       "attempts" = "attempts" + 1, "updatedAt" = ?
     WHERE "id" IN (
       SELECT "id" FROM "jobs"
       WHERE "kind" IN ${list(kinds)}
         AND (("status" = 'queued' AND "runAt" <= ?)
           OR ("status" = 'running' AND "lockedUntil" <= ? AND "attempts" < "maxAttempts"))
       ORDER BY "runAt"
       LIMIT ? ${skipLocked})
     RETURNING *`,
    [workerId, new Date(now.getTime() + leaseMs).toISOString(), at, ...kinds, at, at, limit],
  )
  return records.map(toRow).sort((a, b) => a.runAt.localeCompare(b.runAt))
}

/** Jobs whose instance stopped during their last allowed attempt: nothing is left to retry them with. */
async function failAbandoned(ds: DataSource, kinds: string[], at: string) {
  await run(
    ds,
    `UPDATE "jobs" SET "status" = 'failed', "lockedBy" = NULL, "lockedUntil" = NULL, "finishedAt" = ?,
       "updatedAt" = ?, "lastError" = ?
     WHERE "kind" IN ${list(kinds)} AND "status" = 'running' AND "lockedUntil" <= ?
       AND "attempts" >= "maxAttempts"`,
    [at, at, 'The server stopped during the last attempt; no attempts were left', ...kinds, at],
  )
}

/** Marks a job done, if this worker still holds it; `payload` replaces the stored one (to drop secrets). */
export async function completeJob(
  ds: DataSource,
  job: JobRow,
  workerId: string,
  now: Date,
  payload?: string,
): Promise<boolean> {
  const at = now.toISOString()
  const { affected } = await run(
    ds,
    `UPDATE "jobs" SET "status" = 'done', "lockedBy" = NULL, "lockedUntil" = NULL, "lastError" = NULL,
       "finishedAt" = ?, "updatedAt" = ?, "payload" = ?
     WHERE "id" = ? AND "lockedBy" = ? AND "status" = 'running'`,
    [at, at, payload ?? job.payload, job.id, workerId],
  )
  return affected > 0
}

/** After a failed attempt: queued again for `retryAt`, or failed for good when `retryAt` is null. */
export async function failAttempt(
  ds: DataSource,
  job: JobRow,
  workerId: string,
  now: Date,
  error: string,
  retryAt: Date | null,
): Promise<boolean> {
  const at = now.toISOString()
  const status: JobStatus = retryAt ? 'queued' : 'failed'
  const { affected } = await run(
    ds,
    `UPDATE "jobs" SET "status" = ?, "runAt" = ?, "lastError" = ?, "lockedBy" = NULL, "lockedUntil" = NULL,
       "finishedAt" = ?, "updatedAt" = ?
     WHERE "id" = ? AND "lockedBy" = ? AND "status" = 'running'`,
    [status, (retryAt ?? now).toISOString(), error, retryAt ? null : at, at, job.id, workerId],
  )
  return affected > 0
}

/** Renews the lease of jobs still running here (a long job is not taken over while its instance lives). */
export async function extendLeases(ds: DataSource, ids: string[], workerId: string, until: Date) {
  if (!ids.length) return
  await run(
    ds,
    `UPDATE "jobs" SET "lockedUntil" = ? WHERE "id" IN ${list(ids)} AND "lockedBy" = ? AND "status" = 'running'`,
    [until.toISOString(), ...ids, workerId],
  )
}

/** Gives a failed job a fresh set of attempts, due now. False when it is not (or no longer) failed. */
export async function retryFailedJob(db: DataSource | EntityManager, id: string, now: Date) {
  const at = now.toISOString()
  const { affected } = await run(
    db,
    `UPDATE "jobs" SET "status" = 'queued', "runAt" = ?, "attempts" = 0, "finishedAt" = NULL, "updatedAt" = ?
     WHERE "id" = ? AND "status" = 'failed'`,
    [at, at, id],
  )
  if (affected) noteEnqueued(db instanceof DataSource ? db.manager : db)
  return affected > 0
}

/**
 * A queued job, due or waiting out a retry, made due now with a fresh set of attempts: what it is about has
 * changed (a newer grade), so the wait for the old one is no longer worth keeping. False if it was claimed.
 */
export async function restartQueuedJob(manager: EntityManager, id: string, now: Date): Promise<boolean> {
  const at = now.toISOString()
  const { affected } = await run(
    manager,
    `UPDATE "jobs" SET "runAt" = ?, "attempts" = 0, "lastError" = NULL, "updatedAt" = ?
     WHERE "id" = ? AND "status" = 'queued'`,
    [at, at, id],
  )
  if (affected) noteEnqueued(manager)
  return affected > 0
}

/** Deletes jobs that finished before `before` (failed ones stay until someone retries them). */
export async function pruneDoneJobs(ds: DataSource, before: Date): Promise<number> {
  const { affected, records } = await run(
    ds,
    `DELETE FROM "jobs" WHERE "status" = 'done' AND "finishedAt" < ? RETURNING "id"`,
    [before.toISOString()],
  )
  return affected || records.length
}

export interface JobKindFigures {
  /** Queued and due: waiting for a worker. */
  due: number
  /** Queued for later: a scheduled occurrence, or a retry waiting out its backoff. */
  waiting: number
  /** Leased to an instance right now. */
  running: number
  /** Out of attempts, waiting for an admin. */
  failed: number
  /** Seconds the oldest due job has waited past its run time (0 when none is due). */
  oldestDueSeconds: number
}

/** The queue's depth per kind, for metrics and the admin; finished jobs are not counted. */
export async function readJobQueueFigures(
  ds: DataSource,
  now = new Date(),
): Promise<Record<string, JobKindFigures>> {
  const at = now.toISOString()
  const { records } = await run(
    ds,
    `SELECT "kind", CASE WHEN "status" = 'queued' AND "runAt" > ? THEN 'waiting'
                         WHEN "status" = 'queued' THEN 'due' ELSE "status" END AS "phase",
            COUNT(*) AS "count", MIN("runAt") AS "oldest"
     FROM "jobs" WHERE "status" IN ('queued', 'running', 'failed') GROUP BY 1, 2`,
    [at],
  )
  const figures: Record<string, JobKindFigures> = {}
  for (const { kind, phase, count, oldest } of records as {
    kind: string
    phase: 'due' | 'waiting' | 'running' | 'failed'
    count: number | string
    oldest: string
  }[]) {
    const entry = (figures[kind] ??= { due: 0, waiting: 0, running: 0, failed: 0, oldestDueSeconds: 0 })
    entry[phase] = Number(count)
    if (phase === 'due')
      entry.oldestDueSeconds = Math.max(0, Math.round((now.getTime() - Date.parse(oldest)) / 1000))
  }
  return figures
}
