// A unit of background work in the durable queue (server/infrastructure/jobs): mail, sweeps, reminders …
import { EntitySchema } from 'typeorm'
import { integer, nullableText, nullableTimestamp, text, timestamp, uuidPrimary, varchar } from './columns'

/** queued: waiting for its run time · running: claimed by an instance until `lockedUntil` · done · failed. */
export type JobStatus = 'queued' | 'running' | 'done' | 'failed'

export interface JobRow {
  id: string
  kind: string
  /** JSON, checked against the kind's schema when enqueued and again when run. */
  payload: string
  status: JobStatus
  /** Not before this time (ISO 8601 UTC); for a failed attempt, when the next one is due. */
  runAt: string
  /** Attempts started so far (counted when claimed, so an attempt a crash cut short counts too). */
  attempts: number
  maxAttempts: number
  /** The instance working on it, and until when its lease holds (a crashed instance's lease runs out). */
  lockedBy: string | null
  lockedUntil: string | null
  /** Why the last attempt failed, in words for people. */
  lastError: string | null
  /** A second enqueue with the same key adds nothing (one job per key, ever). */
  dedupeKey: string | null
  /** Who or what the job is about, in words, for lists and filters (mail: the recipient). */
  label: string
  createdAt: string
  updatedAt: string
  finishedAt: string | null
}

export const JobEntity = new EntitySchema<JobRow>({
  name: 'Job',
  tableName: 'jobs',
  columns: {
    id: uuidPrimary,
    kind: varchar(64),
    payload: text,
    status: varchar(16),
    runAt: timestamp,
    attempts: integer,
    maxAttempts: integer,
    lockedBy: varchar(64, true),
    lockedUntil: nullableTimestamp,
    lastError: nullableText,
    dedupeKey: varchar(200, true),
    label: varchar(320),
    createdAt: timestamp,
    updatedAt: timestamp,
    finishedAt: nullableTimestamp,
  },
  indices: [
    // Claiming: the due queued jobs, oldest first (and leases that ran out).
    { name: 'idx_jobs_status_run_at', columns: ['status', 'runAt'] },
    // The admin outbox and the queue figures: one kind, newest first.
    { name: 'idx_jobs_kind_created', columns: ['kind', 'createdAt'] },
    { name: 'uq_jobs_dedupe_key', columns: ['dedupeKey'], unique: true },
  ],
})
