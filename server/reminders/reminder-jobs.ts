// The two recurring jobs of reminders and digests, registered in server/background-jobs.ts. Each is a
// schedule whose occurrences are jobs (one per occurrence however many instances run); the mail they queue
// carries dedupe keys of its own, so a repeated occurrence sends nothing twice.
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import { centreTimeZone } from '../centre/centre.service'
import { nowMs } from '../infrastructure/clock'
import { defineJobKind, type JobWorker } from '../infrastructure/jobs'
import type { Logger } from '../infrastructure/logging'
import { DIGEST_JOB_KIND, queueDailyDigests } from './daily-digest.service'
import { queueDueReminders } from './due-reminders.service'

/** Every ten minutes: a reminder goes out at most ten minutes after its mark. */
export const DEFAULT_REMINDER_SCAN_CRON = '*/10 * * * *'
/** 07:00 on the centre's clock. */
export const DEFAULT_DIGEST_CRON = '0 7 * * *'

export const reminderScanJob = defineJobKind({
  kind: 'reminders.scan',
  payload: z.object({}),
  retry: { maxAttempts: 3, firstDelayMs: 60_000 },
  timeoutMs: 2 * 60_000,
})

export const dailyDigestJob = defineJobKind({
  kind: DIGEST_JOB_KIND,
  payload: z.object({}),
  retry: { maxAttempts: 5, firstDelayMs: 5 * 60_000 },
  timeoutMs: 5 * 60_000,
})

export interface ReminderJobsOptions {
  dataSource: DataSource
  worker: JobWorker
  log: Logger
  link: (path: string) => string
  scanCron?: string
  digestCron?: string
}

export async function registerReminderJobs(options: ReminderJobsOptions): Promise<void> {
  const { dataSource, worker, log, link } = options
  worker.handle(reminderScanJob, async () => {
    const queued = await queueDueReminders(dataSource, { now: nowMs(), link })
    if (queued) log.info({ queued }, 'due-date reminders queued')
  })
  worker.handle(dailyDigestJob, async (_payload, job) => {
    const queued = await queueDailyDigests(dataSource, { occurrence: job.runAt, link })
    if (queued) log.info({ queued }, 'daily digests queued')
  })
  worker.schedule({
    name: 'reminders.scan',
    cron: options.scanCron ?? DEFAULT_REMINDER_SCAN_CRON,
    job: reminderScanJob,
    payload: {},
  })
  // The zone is read at start: a change of the centre's zone moves the digest from the next restart on.
  worker.schedule({
    name: 'digest.daily',
    cron: options.digestCron ?? DEFAULT_DIGEST_CRON,
    timeZone: await centreTimeZone(dataSource),
    job: dailyDigestJob,
    payload: {},
  })
}
