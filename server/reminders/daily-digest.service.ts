// The instructors' daily digest, one occurrence of a schedule (background-jobs.ts) each morning in the
// centre's time zone. It covers what was submitted since the previous digest ran (the day before, when
// there was none) in the open cohorts each instructor teaches (owner or co-instructor): new submissions,
// how many passed, and each attempt with a safety violation. Nothing new: no mail. Each instructor's mail is
// queued under `digest:<user>:<occurrence>`, so a repeated run of the same occurrence queues nothing twice.
import { In, LessThan, type DataSource } from 'typeorm'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  CohortInstructorEntity,
  JobEntity,
  UserEntity,
} from '../entities'
import { violationsOf } from '../attempts/evidence'
import { centreTimeZone } from '../centre/centre.service'
import { DAY } from '../infrastructure/clock'
import { mailJob } from '../infrastructure/mail/mail-job'
import { dailyDigestMail, type DigestCohort } from '../infrastructure/mail/templates'

export const DIGEST_JOB_KIND = 'digest.daily'

export interface DigestOptions {
  /** The occurrence's scheduled instant: the digest covers up to it. */
  occurrence: Date
  link: (path: string) => string
}

/** Where the previous digest stopped: its occurrence, or a day before this one. */
async function coveredSince(ds: DataSource, occurrence: string): Promise<string> {
  const previous = await ds.getRepository(JobEntity).findOne({
    where: { kind: DIGEST_JOB_KIND, status: 'done', runAt: LessThan(occurrence) },
    order: { runAt: 'DESC' },
    select: { runAt: true },
  })
  return previous?.runAt ?? new Date(Date.parse(occurrence) - DAY).toISOString()
}

/** Queues each instructor's digest; returns how many mails were queued. */
export async function queueDailyDigests(
  ds: DataSource,
  { occurrence, link }: DigestOptions,
): Promise<number> {
  const until = occurrence.toISOString()
  const since = await coveredSince(ds, until)
  const cohorts = await ds.getRepository(CohortEntity).find({
    where: { archived: false },
    select: { id: true, name: true, ownerId: true },
  })
  if (!cohorts.length) return 0
  const assignments = await ds.getRepository(AssignmentEntity).find({
    where: { cohortId: In(cohorts.map((c) => c.id)) },
    select: { id: true, cohortId: true, title: true },
  })
  if (!assignments.length) return 0
  const attempts = await ds
    .getRepository(AttemptEntity)
    .createQueryBuilder('t')
    .select(['t.id', 't.userId', 't.assignmentId', 't.passed', 't.evidence', 't.submittedAt'])
    .where('t.assignmentId IN (:...ids)', { ids: assignments.map((a) => a.id) })
    .andWhere(`t.status = 'submitted' AND t.submittedAt >= :since AND t.submittedAt < :until`, {
      since,
      until,
    })
    .orderBy('t.submittedAt', 'ASC')
    .getMany()
  if (!attempts.length) return 0

  const assignment = new Map(assignments.map((a) => [a.id, a]))
  const apprentices = new Map(
    (
      await ds.getRepository(UserEntity).find({
        where: { id: In([...new Set(attempts.map((a) => a.userId))]) },
        select: { id: true, name: true },
      })
    ).map((u) => [u.id, u.name]),
  )
  const perCohort = new Map<string, DigestCohort>()
  for (const attempt of attempts) {
    const work = attempt.assignmentId ? assignment.get(attempt.assignmentId) : undefined
    if (!work) continue
    const cohort = cohorts.find((c) => c.id === work.cohortId)!
    const entry = perCohort.get(cohort.id) ?? {
      cohortName: cohort.name,
      submissions: 0,
      passed: 0,
      violations: [],
    }
    entry.submissions++
    if (attempt.passed) entry.passed++
    const violations = violationsOf(attempt.evidence)
    if (violations.length) {
      entry.violations.push(
        `${apprentices.get(attempt.userId) ?? 'An apprentice'}, “${work.title}”: ${violations.map((v) => v.label).join('; ')}`,
      )
    }
    perCohort.set(cohort.id, entry)
  }

  const teaching = new Map<string, Set<string>>()
  const teach = (userId: string, cohortId: string) =>
    teaching.set(userId, (teaching.get(userId) ?? new Set()).add(cohortId))
  for (const c of cohorts) teach(c.ownerId, c.id)
  const co = await ds
    .getRepository(CohortInstructorEntity)
    .find({ where: { cohortId: In(cohorts.map((c) => c.id)) }, select: { cohortId: true, userId: true } })
  for (const row of co) teach(row.userId, row.cohortId)
  const instructors = await ds.getRepository(UserEntity).find({
    where: { id: In([...teaching.keys()]) },
    select: { id: true, name: true, email: true, active: true, dailyDigest: true },
  })
  const timeZone = await centreTimeZone(ds)
  return ds.transaction(async (manager) => {
    let queued = 0
    for (const instructor of instructors) {
      if (!instructor.active || instructor.dailyDigest === false || /\.invalid$/i.test(instructor.email))
        continue
      const theirs = cohorts
        .filter((c) => teaching.get(instructor.id)?.has(c.id) && perCohort.has(c.id))
        .sort((a, b) => a.name.localeCompare(b.name))
        .map((c) => perCohort.get(c.id)!)
      if (!theirs.length) continue
      const mail = dailyDigestMail({
        to: instructor.email,
        name: instructor.name,
        since,
        timeZone,
        cohorts: theirs,
        url: link('/'),
        profileUrl: link('/profile'),
      })
      if ((await mailJob.enqueue(manager, mail, { dedupeKey: `digest:${instructor.id}:${until}` })).created)
        queued++
    }
    return queued
  })
}
