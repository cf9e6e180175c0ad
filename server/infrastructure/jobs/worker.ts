// The worker in each instance: claims due jobs of the kinds it has handlers for, runs them a few at a time,
// renews their leases while they run, records success or failure (retry with backoff, or failed for good),
// and enqueues the next occurrence of each schedule. Delivery is at least once: a job whose instance died
// mid-run runs again when its lease ends, so a handler must be safe to repeat (mail: the Message-ID).
import { randomBytes } from 'node:crypto'
import { hostname } from 'node:os'
import type { DataSource } from 'typeorm'
import type { JobRow } from '../../entities'
import type { Logger } from '../logging'
import { JobError, retryDelayMs, type JobKind } from './job-kind'
import { claimJobs, completeJob, extendLeases, failAttempt } from './job-store'
import { occurrenceKey, planSchedule, type PlannedSchedule, type Schedule } from './schedule'
import { onJobsEnqueued } from './wake'

/** What a handler is told about the job it runs. */
export interface RunningJob {
  id: string
  kind: string
  /** 1 on the first attempt. */
  attempt: number
  maxAttempts: number
  /** When it was due (for a schedule's occurrence: the scheduled instant). */
  runAt: Date
  dedupeKey: string | null
  /** Aborted when the attempt runs past the kind's timeout or the worker stops. */
  signal: AbortSignal
}

export type JobHandler<Payload> = (payload: Payload, job: RunningJob) => Promise<void>

export interface HandlerOptions<Payload> {
  /** What to keep of the payload once the job is done (e.g. drop a mail's body holding a one-time link). */
  whenDone?: (payload: Payload) => Payload
}

export interface JobWorkerOptions {
  dataSource: DataSource
  log: Logger
  /** How long a claim holds before another instance may take the job over (renewed while it runs). */
  leaseMs?: number
  /** How often to look for due jobs besides being woken by this instance's own enqueues (0: never). */
  pollMs?: number
  /** Jobs run at once by this instance. */
  concurrency?: number
  clock?: () => Date
  random?: () => number
  /** Names this instance in `lockedBy` (default host, process and a random part). */
  id?: string
}

export interface JobCounts {
  succeeded: number
  retried: number
  failed: number
}

export interface JobWorker {
  readonly id: string
  handle<Payload>(
    kind: JobKind<Payload>,
    handler: JobHandler<Payload>,
    options?: HandlerOptions<Payload>,
  ): void
  schedule<Payload>(schedule: Schedule<Payload>): void
  /** Starts polling (and listening for this instance's enqueues). */
  start(): void
  /** Runs every job due now, including the ones that become due through retries with no wait; for tests. */
  runDue(): Promise<number>
  /** Stops claiming and waits up to `graceMs` for running jobs; unfinished ones are retried after their lease. */
  stop(graceMs?: number): Promise<void>
  /** Attempts finished by this instance since it started, per kind (for metrics). */
  counts(): Record<string, JobCounts>
}

interface Registration {
  kind: JobKind<unknown>
  handler: JobHandler<unknown>
  options: HandlerOptions<unknown>
}

const UNEXPECTED = 'An unexpected error stopped it; the server log has the details'
const STALE_PAYLOAD = 'Its stored details no longer match what this version of Slipway expects'

export function createJobWorker(options: JobWorkerOptions): JobWorker {
  const { dataSource: ds, log } = options
  const leaseMs = options.leaseMs ?? 60_000
  const pollMs = options.pollMs ?? 1000
  const concurrency = options.concurrency ?? 4
  const clock = options.clock ?? (() => new Date())
  const random = options.random ?? Math.random
  const id = options.id ?? `${hostname().slice(0, 40)}:${process.pid}:${randomBytes(3).toString('hex')}`

  const handlers = new Map<string, Registration>()
  const schedules: PlannedSchedule<unknown>[] = []
  const plannedUntil = new Map<string, string>()
  const inFlight = new Map<string, { promise: Promise<void>; abort: AbortController }>()
  const counts: Record<string, JobCounts> = {}
  let running = false
  let heartbeat: NodeJS.Timeout | undefined
  let stopListening: (() => void) | undefined
  let loopDone: Promise<void> | undefined
  let wakeUp: (() => void) | null = null
  let woken = false

  const count = (kind: string, what: keyof JobCounts) =>
    ((counts[kind] ??= { succeeded: 0, retried: 0, failed: 0 })[what] += 1)

  function startHeartbeat() {
    heartbeat ??= setInterval(() => {
      const ids = [...inFlight.keys()]
      extendLeases(ds, ids, id, new Date(clock().getTime() + leaseMs)).catch((err: unknown) =>
        log.error({ err }, 'could not renew job leases'),
      )
    }, leaseMs / 3)
    heartbeat.unref()
  }

  /** Ends the loop's wait at once (a job finished, or this instance enqueued one). */
  function nudge() {
    if (wakeUp) wakeUp()
    else woken = true
  }

  async function pause() {
    if (woken) {
      woken = false
      return
    }
    await new Promise<void>((resolve) => {
      const timer = pollMs > 0 ? setTimeout(() => wakeUp?.(), pollMs) : undefined
      wakeUp = () => {
        wakeUp = null
        clearTimeout(timer)
        resolve()
      }
    })
  }

  async function execute(job: JobRow, abort: AbortController): Promise<void> {
    const registration = handlers.get(job.kind)!
    const context = { jobId: job.id, kind: job.kind, attempt: job.attempts }
    let payload: unknown
    try {
      payload = registration.kind.payload.parse(JSON.parse(job.payload))
    } catch (err) {
      log.error({ ...context, err }, 'job payload does not match its kind; failing it')
      await failAttempt(ds, job, id, clock(), STALE_PAYLOAD, null)
      count(job.kind, 'failed')
      return
    }
    let timer: NodeJS.Timeout | undefined
    try {
      const timeout = new Promise<never>((_, reject) => {
        timer = setTimeout(() => {
          const minutes = Math.round(registration.kind.timeoutMs / 60_000)
          reject(new JobError(`It did not finish within ${minutes || 1} minute(s)`))
          abort.abort() // after the rejection, so a handler that returns on abort does not count as done
        }, registration.kind.timeoutMs)
      })
      await Promise.race([
        registration.handler(payload, {
          id: job.id,
          kind: job.kind,
          attempt: job.attempts,
          maxAttempts: job.maxAttempts,
          runAt: new Date(job.runAt),
          dedupeKey: job.dedupeKey,
          signal: abort.signal,
        }),
        timeout,
      ])
      const kept = registration.options.whenDone?.(payload)
      const ours = await completeJob(
        ds,
        job,
        id,
        clock(),
        kept === undefined ? undefined : JSON.stringify(kept),
      )
      if (!ours) log.warn(context, 'job finished after its lease ran out and another instance took it')
      count(job.kind, 'succeeded')
    } catch (err) {
      const plain = err instanceof JobError
      const last = (plain && err.permanent) || job.attempts >= job.maxAttempts
      const retryAt = last
        ? null
        : new Date(clock().getTime() + retryDelayMs(registration.kind.retry, job.attempts, random))
      log[plain ? 'warn' : 'error'](
        { ...context, err, retryAt },
        last ? 'job failed; no attempts left' : 'job attempt failed; will retry',
      )
      await failAttempt(ds, job, id, clock(), plain ? err.message : UNEXPECTED, retryAt)
      count(job.kind, last ? 'failed' : 'retried')
    } finally {
      clearTimeout(timer)
    }
  }

  /** Claims as many due jobs as there are free slots and starts them; returns how many it started. */
  async function fill(): Promise<number> {
    const free = concurrency - inFlight.size
    if (free <= 0) return 0
    const jobs = await claimJobs(ds, {
      kinds: [...handlers.keys()],
      workerId: id,
      leaseMs,
      limit: free,
      now: clock(),
    })
    for (const job of jobs) {
      const abort = new AbortController()
      const promise = execute(job, abort)
        .catch((err: unknown) => log.error({ err, jobId: job.id }, 'could not record the outcome of a job'))
        .finally(() => {
          inFlight.delete(job.id)
          if (!inFlight.size && heartbeat) {
            clearInterval(heartbeat)
            heartbeat = undefined
          }
          nudge()
        })
      inFlight.set(job.id, { promise, abort })
    }
    if (jobs.length) startHeartbeat()
    return jobs.length
  }

  async function planSchedules() {
    for (const schedule of schedules) {
      const next = schedule.nextAfter(clock())
      if (!next || plannedUntil.get(schedule.name) === next.toISOString()) continue
      await schedule.job.enqueue(ds.manager, schedule.payload, {
        runAt: next,
        dedupeKey: occurrenceKey(schedule.name, next),
      })
      plannedUntil.set(schedule.name, next.toISOString())
    }
  }

  async function loop() {
    while (running) {
      try {
        await planSchedules()
        await fill()
      } catch (err) {
        log.error({ err }, 'job worker could not claim jobs; trying again shortly')
      }
      await pause()
    }
  }

  return {
    id,
    handle(kind, handler, handlerOptions = {}) {
      if (handlers.has(kind.kind))
        throw new Error(`A handler for job kind "${kind.kind}" is already registered`)
      handlers.set(kind.kind, {
        kind: kind as JobKind<unknown>,
        handler: handler as JobHandler<unknown>,
        options: handlerOptions as HandlerOptions<unknown>,
      })
    },
    schedule(schedule) {
      schedules.push(planSchedule(schedule) as PlannedSchedule<unknown>)
    },
    start() {
      if (running) return
      running = true
      stopListening = onJobsEnqueued(ds, nudge)
      loopDone = loop()
    },
    async runDue() {
      let ran = 0
      await planSchedules()
      for (;;) {
        const started = await fill()
        ran += started
        if (!started && !inFlight.size) return ran
        await Promise.race([...inFlight.values()].map((j) => j.promise))
      }
    },
    async stop(graceMs = 5000) {
      running = false
      stopListening?.()
      nudge()
      await loopDone
      const pending = [...inFlight.values()]
      if (pending.length) {
        let timer: NodeJS.Timeout | undefined
        const waited = await Promise.race([
          Promise.all(pending.map((j) => j.promise)).then(() => true),
          new Promise<false>((resolve) => (timer = setTimeout(() => resolve(false), graceMs))),
        ])
        clearTimeout(timer)
        if (!waited) {
          for (const job of inFlight.values()) job.abort.abort()
          log.warn(
            { jobs: inFlight.size },
            'stopped with jobs still running; they run again when their lease ends',
          )
        }
      }
      clearInterval(heartbeat)
      heartbeat = undefined
    },
    counts: () => structuredClone(counts),
  }
}
