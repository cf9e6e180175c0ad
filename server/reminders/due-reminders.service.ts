// The due-date reminder scan, run every few minutes by a schedule (background-jobs.ts). It finds the work
// whose due date — the assignment's, or an apprentice's own after an extension — falls within the longest
// reminder mark, works out each member's standing with the gradebook's rules, and queues the mail of every
// reminder due now under its own dedupe key (reminderKey), inside one transaction: however many instances
// scan, and however often a restart repeats a scan, each reminder is one mail job, sent once.
import { In, type DataSource } from 'typeorm'
import { DUE_REMINDER_HOURS } from '@shared/api/mail-preferences'
import {
  AssignmentEntity,
  AssignmentExceptionEntity,
  CohortEntity,
  EnrollmentEntity,
  UserEntity,
  type AssignmentRow,
} from '../entities'
import { centreTimeZone } from '../centre/centre.service'
import { pairKey, standingsFor } from '../gradebook/standings'
import { HOUR } from '../infrastructure/clock'
import { mailJob } from '../infrastructure/mail/mail-job'
import { dueReminderMail } from '../infrastructure/mail/templates'
import { reminderDue, reminderKey } from './reminder-rules'

export interface ReminderScanOptions {
  now: number
  /** Builds a link into the app from a path (PUBLIC_BASE_URL). */
  link: (path: string) => string
  hours?: readonly number[]
}

/** Assignments of open cohorts due (for the cohort or for someone's extension) within the window. */
async function candidates(ds: DataSource, from: string, to: string): Promise<AssignmentRow[]> {
  const between = { from, to }
  const byOwnDate = await ds
    .getRepository(AssignmentEntity)
    .createQueryBuilder('a')
    .where('a.dueAt > :from AND a.dueAt <= :to', between)
    .getMany()
  const extended = await ds
    .getRepository(AssignmentExceptionEntity)
    .createQueryBuilder('e')
    .select('e.assignmentId', 'assignmentId')
    .distinct(true)
    .where('e.dueAt > :from AND e.dueAt <= :to', between)
    .getRawMany<{ assignmentId: string }>()
  const seen = new Set(byOwnDate.map((a) => a.id))
  const more = extended.map((e) => e.assignmentId).filter((id) => !seen.has(id))
  const all = [
    ...byOwnDate,
    ...(more.length ? await ds.getRepository(AssignmentEntity).findBy({ id: In(more) }) : []),
  ]
  if (!all.length) return []
  const open = await ds.getRepository(CohortEntity).find({
    where: { id: In([...new Set(all.map((a) => a.cohortId))]), archived: false },
    select: { id: true },
  })
  const openIds = new Set(open.map((c) => c.id))
  return all.filter((a) => openIds.has(a.cohortId))
}

/** Queues every reminder due at `now`; returns how many new mail jobs were queued. */
export async function queueDueReminders(ds: DataSource, options: ReminderScanOptions): Promise<number> {
  const hours = options.hours ?? DUE_REMINDER_HOURS
  const now = options.now
  const nowIso = new Date(now).toISOString()
  const horizon = new Date(now + Math.max(...hours) * HOUR).toISOString()
  const assignments = await candidates(ds, nowIso, horizon)
  if (!assignments.length) return 0

  const enrolments = await ds.getRepository(EnrollmentEntity).find({
    where: { cohortId: In([...new Set(assignments.map((a) => a.cohortId))]) },
    select: { cohortId: true, userId: true },
  })
  const members = new Map<string, string[]>()
  for (const e of enrolments) members.set(e.cohortId, [...(members.get(e.cohortId) ?? []), e.userId])
  const userIds = [...new Set(enrolments.map((e) => e.userId))]
  if (!userIds.length) return 0
  const users = new Map(
    (
      await ds.getRepository(UserEntity).find({
        where: { id: In(userIds) },
        select: { id: true, name: true, email: true, role: true, active: true, dueReminders: true },
      })
    ).map((u) => [u.id, u]),
  )
  const cohorts = new Map(
    (
      await ds.getRepository(CohortEntity).find({
        where: { id: In([...members.keys()]) },
        select: { id: true, name: true },
      })
    ).map((c) => [c.id, c.name]),
  )
  const standings = await standingsFor(ds, assignments, (a) => members.get(a.cohortId) ?? [], nowIso)
  const timeZone = await centreTimeZone(ds)

  const due: { key: string; mail: ReturnType<typeof dueReminderMail> }[] = []
  for (const assignment of assignments) {
    for (const userId of members.get(assignment.cohortId) ?? []) {
      const user = users.get(userId)
      const standing = standings.get(pairKey(assignment.id, userId))
      if (!user || !standing || user.role !== 'apprentice') continue
      const mark = reminderDue(
        {
          terms: standing.terms,
          passed: standing.passed,
          wantsReminders: Boolean(user.active) && user.dueReminders !== false,
        },
        now,
        hours,
      )
      // Addresses on the reserved .invalid domain (learning-platform accounts) can receive nothing.
      if (mark === null || standing.terms.dueAt === null || /\.invalid$/i.test(user.email)) continue
      due.push({
        key: reminderKey(assignment.id, userId, mark, standing.terms.dueAt),
        mail: dueReminderMail({
          to: user.email,
          name: user.name,
          title: assignment.title,
          cohortName: cohorts.get(assignment.cohortId) ?? '',
          dueAt: standing.terms.dueAt,
          timeZone,
          hours: mark,
          tried: standing.attempts > 0,
          url: options.link(`/assignments/${assignment.id}`),
          profileUrl: options.link('/profile'),
        }),
      })
    }
  }
  if (!due.length) return 0
  return ds.transaction(async (manager) => {
    let queued = 0
    for (const { key, mail } of due) {
      if ((await mailJob.enqueue(manager, mail, { dedupeKey: key })).created) queued++
    }
    return queued
  })
}
