// Prometheus metrics (prom-client), served at /api/metrics (health/health.router.ts): request latency by
// route template, the grading pool's queue and task times, and the depth and failures of background queues
// (mail, jobs), which report through watchQueues() so each queue owns how it counts.
import type { RequestHandler } from 'express'
import { collectDefaultMetrics, Counter, Gauge, Histogram, Registry } from 'prom-client'
import type { GradingPoolStats, TaskKind } from './grading/grading-pool'

/** One background queue (or one kind of job) as the metrics see it at a scrape. */
export interface QueueFigures {
  /** The label: `mail`, or a job kind. */
  queue: string
  /** Items waiting or being worked on. */
  depth: number
  /** Items that failed for good (given up after their retries). */
  failed: number
}

/** Read at each scrape (it may query the database). */
export type QueueReader = () => QueueFigures[] | Promise<QueueFigures[]>

export interface Metrics {
  registry: Registry
  /** Times every request by method, route template (`/api/attempts/:id`) and status. */
  httpMiddleware: RequestHandler
  /** Reports each grading task (grading-pool.ts onTask). */
  gradingTask(kind: TaskKind, seconds: number, outcome: 'ok' | 'rejected' | 'error'): void
  /** The pool whose queue depth and threads are read at each scrape. */
  watchGradingPool(stats: () => GradingPoolStats): void
  /** Background queues (mail, jobs) whose depth and failures are read at each scrape, labelled queue="…". */
  watchQueues(read: QueueReader): void
}

const LATENCY_BUCKETS = [0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10]

export function createMetrics(): Metrics {
  const registry = new Registry()
  collectDefaultMetrics({ register: registry })

  const http = new Histogram({
    name: 'slipway_http_request_duration_seconds',
    help: 'Time from receiving a request to the end of its response, by route template',
    labelNames: ['method', 'route', 'status'] as const,
    buckets: LATENCY_BUCKETS,
    registers: [registry],
  })

  let poolStats: (() => GradingPoolStats) | undefined
  new Gauge({
    name: 'slipway_grading_queue_depth',
    help: 'Grading tasks (reading or grading a submission) waiting for a thread',
    registers: [registry],
    collect() {
      this.set(poolStats?.().queued ?? 0)
    },
  })
  new Gauge({
    name: 'slipway_grading_threads',
    help: 'Grading threads running',
    registers: [registry],
    collect() {
      this.set(poolStats?.().threadsUp ?? 0)
    },
  })
  const gradingTime = new Histogram({
    name: 'slipway_grading_task_duration_seconds',
    help: 'Time a grading task took, queueing included (read: parse and validate a body; grade: replay a log)',
    labelNames: ['task', 'outcome'] as const,
    buckets: LATENCY_BUCKETS,
    registers: [registry],
  })
  const gradingRejected = new Counter({
    name: 'slipway_grading_rejected_total',
    help: 'Submissions refused with 503 because the grading queue was full',
    registers: [registry],
  })

  const readers: QueueReader[] = []
  // Both gauges are filled from one read per scrape (the depth gauge is collected first).
  let lastRead: QueueFigures[] = []
  const failedGauge = new Gauge({
    name: 'slipway_queue_failed',
    help: 'Items of a background queue that failed for good',
    labelNames: ['queue'] as const,
    registers: [registry],
    collect() {
      for (const q of lastRead) this.set({ queue: q.queue }, q.failed)
    },
  })
  new Gauge({
    name: 'slipway_queue_depth',
    help: 'Items waiting in a background queue (mail, jobs)',
    labelNames: ['queue'] as const,
    registers: [registry],
    async collect() {
      lastRead = (await Promise.all(readers.map((read) => read()))).flat()
      for (const q of lastRead) this.set({ queue: q.queue }, q.depth)
    },
  })
  void failedGauge

  return {
    registry,
    httpMiddleware(req, res, next) {
      const started = process.hrtime.bigint()
      // Express sets req.route when a route matches, while req.baseUrl still names the router's mount
      // point (it is reset when an error leaves the router): read the template at that moment.
      let template: string | undefined
      let route: unknown
      Object.defineProperty(req, 'route', {
        configurable: true,
        enumerable: true,
        get: () => route,
        set(value: { path?: unknown } | undefined) {
          route = value
          if (typeof value?.path === 'string')
            template = value.path === '/' && req.baseUrl ? req.baseUrl : req.baseUrl + value.path
        },
      })
      res.once('finish', () => {
        const seconds = Number(process.hrtime.bigint() - started) / 1e9
        const label = template ?? (req.path.startsWith('/api/') ? '/api (no route)' : '(client)')
        http.observe({ method: req.method, route: label, status: String(res.statusCode) }, seconds)
      })
      next()
    },
    gradingTask(kind, seconds, outcome) {
      gradingTime.observe({ task: kind, outcome }, seconds)
      if (outcome === 'rejected') gradingRejected.inc()
    },
    watchGradingPool(stats) {
      poolStats = stats
    },
    watchQueues(read) {
      readers.push(read)
    },
  }
}
