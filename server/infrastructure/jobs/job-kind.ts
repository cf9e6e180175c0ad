// A kind of job: its name, the shape of its payload, how often and how patiently it is retried — and
// `enqueue`, which adds one to the queue inside the caller's transaction, so the job exists exactly when the
// change that causes it was committed.
import { randomUUID } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import type { z } from 'zod'
import { JobEntity, type JobRow } from '../../entities'
import { noteEnqueued } from './wake'

export interface RetryPolicy {
  /** Attempts before the job is marked failed (the first run counts). */
  maxAttempts: number
  /** Wait after the first failed attempt; each later wait doubles, up to `maxDelayMs`. */
  firstDelayMs: number
  maxDelayMs: number
}

export const DEFAULT_RETRY: RetryPolicy = { maxAttempts: 8, firstDelayMs: 10_000, maxDelayMs: 3_600_000 }

export interface JobKindSpec<Payload> {
  /** Stored in every row: never rename a kind that has jobs in a deployed database. */
  kind: string
  payload: z.ZodType<Payload>
  retry?: Partial<RetryPolicy>
  /** An attempt still running after this long counts as failed (default 5 minutes). */
  timeoutMs?: number
  /** Who or what a job is about, in words, for lists and filters (mail: the recipient). */
  label?: (payload: Payload) => string
}

export interface EnqueueOptions {
  /** Not before this time (default: now). */
  runAt?: Date
  /** One job per key, ever: a second enqueue with the same key adds nothing and returns the first job. */
  dedupeKey?: string
  /** Overrides the kind's retry policy for this job. */
  maxAttempts?: number
}

export interface EnqueuedJob {
  id: string
  /** False when a job with the same dedupe key already existed. */
  created: boolean
}

export interface JobKind<Payload> {
  readonly kind: string
  readonly payload: z.ZodType<Payload>
  readonly retry: RetryPolicy
  readonly timeoutMs: number
  readonly label: (payload: Payload) => string
  /**
   * Adds a job. Pass the transaction's manager (`ds.transaction(async (manager) => …)`) so the job commits or
   * rolls back with the change that causes it; `ds.manager` only for work that belongs to no change.
   */
  enqueue(manager: EntityManager, payload: Payload, options?: EnqueueOptions): Promise<EnqueuedJob>
}

/** A failed attempt, explained in words an admin can act on; `permanent` skips the remaining attempts. */
export class JobError extends Error {
  readonly permanent: boolean
  constructor(message: string, options: { permanent?: boolean; cause?: unknown } = {}) {
    super(message, { cause: options.cause })
    this.name = 'JobError'
    this.permanent = options.permanent ?? false
  }
}

/**
 * The wait before the next attempt, after `attempts` attempts have failed: doubling from `firstDelayMs`, capped
 * at `maxDelayMs`, and up to a fifth shorter at random so jobs that failed together do not retry together.
 */
export function retryDelayMs(policy: RetryPolicy, attempts: number, random = Math.random): number {
  const full = Math.min(policy.maxDelayMs, policy.firstDelayMs * 2 ** Math.max(0, attempts - 1))
  return Math.round(full * (1 - 0.2 * random()))
}

export function defineJobKind<Payload>(spec: JobKindSpec<Payload>): JobKind<Payload> {
  const retry = { ...DEFAULT_RETRY, ...spec.retry }
  const label = spec.label ?? (() => '')
  return {
    kind: spec.kind,
    payload: spec.payload,
    retry,
    timeoutMs: spec.timeoutMs ?? 5 * 60_000,
    label,
    async enqueue(manager, payload, options = {}) {
      // Checked here, so a bad payload fails the request that made it, not a worker minutes later.
      const checked = spec.payload.parse(payload)
      const now = new Date().toISOString()
      const row: JobRow = {
        id: randomUUID(),
        kind: spec.kind,
        payload: JSON.stringify(checked),
        status: 'queued',
        runAt: (options.runAt ?? new Date()).toISOString(),
        attempts: 0,
        maxAttempts: options.maxAttempts ?? retry.maxAttempts,
        lockedBy: null,
        lockedUntil: null,
        lastError: null,
        dedupeKey: options.dedupeKey ?? null,
        label: label(checked).slice(0, 320),
        createdAt: now,
        updatedAt: now,
        finishedAt: null,
      }
      if (row.dedupeKey === null) {
        await manager.getRepository(JobEntity).insert(row)
        noteEnqueued(manager)
        return { id: row.id, created: true }
      }
      // ON CONFLICT DO NOTHING (PostgreSQL) / INSERT OR IGNORE (SQLite): no error, so the caller's
      // transaction stays usable; on PostgreSQL a racing insert of the same key waits for the other to end.
      await manager.createQueryBuilder().insert().into(JobEntity).values(row).orIgnore().execute()
      const existing = await manager
        .getRepository(JobEntity)
        .findOne({ where: { dedupeKey: row.dedupeKey }, select: { id: true } })
      const created = existing?.id === row.id
      if (created) noteEnqueued(manager)
      return { id: existing?.id ?? row.id, created }
    },
  }
}
