// Recurring jobs: a cron expression read in a time zone ("0 7 * * *" in the centre's zone = 07:00 there,
// daylight saving included). Each occurrence is enqueued ahead of time under a dedupe key naming the schedule
// and the instant, so however many instances run the schedule, each occurrence is one job.
import { Cron } from 'croner'
import type { JobKind } from './job-kind'

export interface Schedule<Payload> {
  /** Part of every occurrence's dedupe key: keep it stable across releases. */
  name: string
  /** Five fields: minute hour day-of-month month day-of-week (e.g. `0 7 * * *`, `30 3 * * 1`). */
  cron: string
  /** IANA zone the expression is read in (default UTC), e.g. `Europe/London`. */
  timeZone?: string
  job: JobKind<Payload>
  payload: Payload
}

export interface PlannedSchedule<Payload> extends Schedule<Payload> {
  /** The first occurrence strictly after `after`, or null if the expression has no more. */
  nextAfter(after: Date): Date | null
}

/** Checks the expression and zone now (a typo fails at start, not at 07:00). */
export function planSchedule<Payload>(schedule: Schedule<Payload>): PlannedSchedule<Payload> {
  const cron = new Cron(schedule.cron, { timezone: schedule.timeZone ?? 'UTC', paused: true })
  cron.nextRun() // an unknown time zone throws only when a time is computed
  return { ...schedule, nextAfter: (after) => cron.nextRun(after) }
}

export const occurrenceKey = (name: string, at: Date) => `schedule:${name}:${at.toISOString()}`
