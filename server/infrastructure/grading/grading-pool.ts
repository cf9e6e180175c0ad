// Grading off the event loop: a pool of worker threads (piscina) reads submissions from their raw bodies
// and grades their logs, so a long attempt never holds up other requests. The queue in front of the threads
// is bounded: when it is full the submission is refused with 503 and Retry-After before anything is stored.
import { Piscina } from 'piscina'
import type { InjectedFault } from '@shared/model'
import type { ReferenceResult } from '@shared/api/scenarioAuthoring'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import { HttpError } from '../../http-error'
import { unreplayableLog } from './grading'
import type {
  GradingTask,
  InjectableReport,
  LiveRecordsInLog,
  LogGradeReport,
  ReadReport,
  SubmissionHeader,
} from './grading-worker'
import { workerFile } from '../worker-file'
import { GRADING_THREAD_RESOURCE_LIMITS } from './thread-limits'

/** A submission's body after a thread has parsed and validated it. */
export interface ReadSubmission {
  request: SubmissionHeader
  /** The validated log as JSON text: what the attempt row stores. */
  eventsJson: string
  eventCount: number
  hintRevealed: boolean
  live: LiveRecordsInLog
}

/** A grade as the attempt row stores it. */
export interface StoredGrade {
  score: number
  passed: boolean
  evidenceJson: string
}

export type TaskKind = GradingTask['kind']

export interface GradingPoolStats {
  /** Threads configured. */
  threads: number
  /** Threads running now (piscina replaces one that dies). */
  threadsUp: number
  /** Tasks waiting for a thread. */
  queued: number
  /** Most tasks allowed to wait. */
  queueLimit: number
}

export interface GradingPool {
  /** Parses and validates a submission body in a thread; a bad one is the 400 express.json and validate() give. */
  read(body: Uint8Array | null): Promise<ReadSubmission>
  /** Grades a validated log against a scenario version at the attempt's level; an unreplayable log is a 400. */
  grade(
    scenario: { id: string; document: string },
    eventsJson: string,
    assistance?: AssistanceLevel,
  ): Promise<StoredGrade>
  /** Live classroom: the faults the bench offers as a live log leaves it (shared/scenario/injectable.ts). */
  injectable(scenario: { id: string; document: string }, eventsJson: string): Promise<InjectedFault[]>
  /** Authoring: a reference run against a checked document (an unreplayable run is reported, not thrown). */
  reference(document: string, eventsJson: string): Promise<ReferenceResult>
  /** Resolves once the threads have started and answered a first task (readiness). */
  warm(): Promise<void>
  stats(): GradingPoolStats
  /** Waits for queued and running tasks, then stops the threads. */
  close(): Promise<void>
  readonly threads: number
}

export interface GradingPoolOptions {
  /** Worker threads (config.gradingThreads). */
  threads: number
  /** Tasks allowed to wait for a thread before submissions are refused with 503 (default 16 per thread). */
  queueLimit?: number
  /** The worker script (default: the built one beside the bundle, or bundled from source). */
  workerFile?: string
  /** Called after each task with its duration, for the metrics. */
  onTask?: (kind: TaskKind, seconds: number, outcome: 'ok' | 'rejected' | 'error') => void
}

const QUEUE_FULL = 'Task queue is at limit'

export function createGradingPool(options: GradingPoolOptions): GradingPool {
  const threads = options.threads
  const queueLimit = options.queueLimit ?? threads * 16
  const pool = (options.workerFile ? Promise.resolve(options.workerFile) : workerFile('grading-worker')).then(
    (filename) =>
      new Piscina<GradingTask, ReadReport | LogGradeReport | InjectableReport | ReferenceResult>({
        filename,
        minThreads: threads,
        maxThreads: threads,
        maxQueue: queueLimit,
        // Plain JavaScript: no loader flags from the parent (tsx in development) reach the threads. And no
        // require() of an ES module: Piscina tries require() first, and on Node 20.20 a thread terminated
        // while require() is instantiating the worker's module aborts the whole process ("FATAL ERROR:
        // v8::Module::IsGraphAsync … must be used on an instantiated module", seen when a pool closed
        // straight after it opened). Refused, Piscina falls back to import(), which a termination can stop.
        execArgv: ['--no-experimental-require-module'],
        // A young generation sized for replays (see thread-limits.ts).
        resourceLimits: GRADING_THREAD_RESOURCE_LIMITS,
        // Threads stay up: starting one costs far more than a grade.
        idleTimeout: Number.POSITIVE_INFINITY,
      }),
  )
  // Keep the rejection handled until someone awaits it (a missing worker build surfaces on first use).
  pool.catch(() => {})
  let current:
    Piscina<GradingTask, ReadReport | LogGradeReport | InjectableReport | ReferenceResult> | undefined
  void pool.then((p) => (current = p))

  /** Mean task time, for the Retry-After estimate. */
  let meanSeconds = 0.01

  function busy(): HttpError {
    const waiting = (current?.queueSize ?? queueLimit) + threads
    const seconds = Math.min(60, Math.max(1, Math.ceil((waiting * meanSeconds) / threads)))
    return new HttpError(
      503,
      'server_busy',
      'The server is busy grading other attempts; nothing was saved. Try again in a moment.',
      undefined,
      { 'Retry-After': String(seconds) },
    )
  }

  async function run<R>(task: GradingTask): Promise<R> {
    const threadsReady = await pool
    const started = performance.now()
    try {
      const result = (await threadsReady.run(task)) as R
      const seconds = (performance.now() - started) / 1000
      meanSeconds = meanSeconds * 0.9 + seconds * 0.1
      options.onTask?.(task.kind, seconds, 'ok')
      return result
    } catch (error) {
      const full = error instanceof Error && error.message === QUEUE_FULL
      options.onTask?.(task.kind, (performance.now() - started) / 1000, full ? 'rejected' : 'error')
      throw full ? busy() : error
    }
  }

  return {
    threads,
    async read(body) {
      const report = await run<ReadReport>({ kind: 'read', body })
      if (!report.ok) throw new HttpError(400, report.code, report.message, report.details)
      const { ok: _ok, ...read } = report
      return read
    },
    async grade(scenario, eventsJson, assistance) {
      const report = await run<LogGradeReport>({
        kind: 'grade',
        scenarioId: scenario.id,
        document: scenario.document,
        eventsJson,
        assistance,
      })
      if (!report.ok) throw unreplayableLog(report.inputError)
      const { ok: _ok, ...grade } = report
      return grade
    },
    async injectable(scenario, eventsJson) {
      const report = await run<InjectableReport>({
        kind: 'injectable',
        scenarioId: scenario.id,
        document: scenario.document,
        eventsJson,
      })
      if (!report.ok) throw unreplayableLog(report.inputError)
      return report.faults
    },
    reference: (document, eventsJson) => run<ReferenceResult>({ kind: 'reference', document, eventsJson }),
    async warm() {
      const threadsReady = await pool
      // One tiny task per thread: each answers only once it has loaded the grader.
      await Promise.all(Array.from({ length: threads }, () => threadsReady.run({ kind: 'read', body: null })))
    },
    stats: () => ({
      threads,
      threadsUp: current?.threads.length ?? 0,
      queued: current?.queueSize ?? 0,
      queueLimit,
    }),
    async close() {
      const threadsReady = await pool.catch(() => undefined)
      await threadsReady?.close()
    },
  }
}
