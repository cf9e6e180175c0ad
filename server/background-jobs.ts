// The background work of one instance: the job worker with a handler for every kind (mail, grades back to
// learning platforms, sweeps), the mail relay it delivers to (a real one, or the embedded outbox), and the recurring housekeeping. main.ts starts it, and so
// does the API test harness (without the timer: tests run due jobs with `worker.runDue()`).
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import type { AppConfig } from './config'
import {
  createJobWorker,
  defineJobKind,
  pruneDoneJobs,
  readJobQueueFigures,
  type JobCounts,
  type JobKindFigures,
  type JobWorker,
} from './infrastructure/jobs'
import type { Logger } from './infrastructure/logging'
import { postScore } from './lti/passback.service'
import { createServiceTokenCache } from './lti/platform-client'
import { scorePostJob } from './lti/score-post-job'
import { mailJob, withoutBody } from './infrastructure/mail/mail-job'
import { createMailDelivery, type SmtpTarget } from './infrastructure/mail/mailer'
import { pruneOutbox, startOutboxSmtp, type OutboxSmtp } from './infrastructure/mail/outbox-smtp'
import { sweepUploads, sweepUploadsJob } from './infrastructure/storage/upload-sweep'
import { LIVE_COPY_RETENTION_DAYS, pruneLiveCopies } from './live/live-retention'
import { registerReminderJobs } from './reminders/reminder-jobs'

/** Sent mail and finished jobs are kept this long (the admin outbox lists them), then deleted. */
export const RETENTION_DAYS = 90

const housekeepingJob = defineJobKind({
  kind: 'housekeeping',
  payload: z.object({}),
  retry: { maxAttempts: 3, firstDelayMs: 5 * 60_000 },
})

export interface BackgroundJobsOptions {
  dataSource: DataSource
  config: AppConfig
  log: Logger
  /** Poll for due jobs and run them as they come (default); false leaves that to `worker.runDue()`. */
  run?: boolean
}

export interface JobKindReport {
  /** The shared queue (the same figures on every instance). */
  queue: JobKindFigures
  /** Attempts this instance has finished since it started. */
  thisInstance: JobCounts
}

export interface BackgroundJobs {
  worker: JobWorker
  /** The embedded relay, when no SMTP_HOST is set. */
  outbox?: OutboxSmtp
  /** Per kind: the queue's depth (shared by every instance) and this instance's finished attempts (metrics). */
  figures(): Promise<Record<string, JobKindReport>>
  /** Stops claiming, waits up to `graceMs` for running jobs, closes the relay connection and the outbox. */
  close(graceMs?: number): Promise<void>
}

export async function startBackgroundJobs({
  dataSource,
  config,
  log,
  run = true,
}: BackgroundJobsOptions): Promise<BackgroundJobs> {
  let outbox: OutboxSmtp | undefined
  let target: SmtpTarget
  if (config.smtp) {
    target = { ...config.smtp, requireTls: true }
  } else {
    outbox = await startOutboxSmtp(dataSource, log)
    target = { host: outbox.host, port: outbox.port, secure: false }
    log.info({ port: outbox.port }, 'embedded SMTP outbox listening on loopback')
  }
  const mail = createMailDelivery({
    target,
    from: config.mailFrom,
    messageIdDomain: new URL(config.publicBaseUrl).hostname,
  })
  const worker = createJobWorker({ dataSource, log, leaseMs: config.jobLeaseMs })
  // With a real relay the body (which may hold a one-time link) is not kept once sent; locally it is the outbox.
  worker.handle(mailJob, mail.deliver, config.smtp ? { whenDone: withoutBody } : {})
  // Grades back to learning platforms; this worker keeps its own service tokens between posts.
  const passback = { dataSource, serviceTokens: createServiceTokenCache() }
  worker.handle(scorePostJob, (post, job) => postScore(passback, post, job))
  worker.handle(sweepUploadsJob, async () => {
    await sweepUploads(dataSource, config.dataDir, log)
  })
  worker.handle(housekeepingJob, async () => {
    const before = new Date(Date.now() - RETENTION_DAYS * 86_400_000)
    const jobs = await pruneDoneJobs(dataSource, before)
    const messages = await pruneOutbox(dataSource, before)
    if (jobs || messages) log.info({ jobs, messages }, 'finished jobs and outbox messages pruned')
    const liveEvents = await pruneLiveCopies(
      dataSource,
      new Date(Date.now() - LIVE_COPY_RETENTION_DAYS * 86_400_000),
    )
    if (liveEvents) log.info({ liveEvents }, 'live copies of closed panels pruned')
  })
  worker.schedule({ name: 'uploads.sweep', cron: '17 * * * *', job: sweepUploadsJob, payload: {} })
  worker.schedule({ name: 'housekeeping', cron: '40 3 * * *', job: housekeepingJob, payload: {} })
  // Due-date reminders and the instructors' daily digest (server/reminders/).
  await registerReminderJobs({
    dataSource,
    worker,
    log,
    link: (path) => `${config.publicBaseUrl}${path}`,
    scanCron: config.reminderScanCron,
    digestCron: config.digestCron,
  })

  await sweepUploads(dataSource, config.dataDir, log)
  if (run) worker.start()

  return {
    worker,
    outbox,
    async figures() {
      const depth = await readJobQueueFigures(dataSource)
      const counts = worker.counts()
      const report: Record<string, JobKindReport> = {}
      for (const kind of new Set([...Object.keys(depth), ...Object.keys(counts)])) {
        report[kind] = {
          queue: depth[kind] ?? { due: 0, waiting: 0, running: 0, failed: 0, oldestDueSeconds: 0 },
          thisInstance: counts[kind] ?? { succeeded: 0, retried: 0, failed: 0 },
        }
      }
      return report
    },
    async close(graceMs = 5000) {
      await worker.stop(graceMs)
      mail.close()
      await outbox?.close()
    },
  }
}
