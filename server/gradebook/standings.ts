// Where each apprentice stands on each assignment: the database sums attempts up per pair (attemptTallies),
// this module gathers each apprentice's own terms (enrolment date, exception, audience), and the shared
// rules (shared/progress) turn both into a status and the score that counts.
import { In, type DataSource, type EntityManager } from 'typeorm'
import {
  NO_ATTEMPTS,
  personalTerms,
  workStanding,
  type ApprenticeFacts,
  type AssignmentTerms,
  type AttemptTally,
  type PersonalTerms,
  type WorkStatus,
} from '@shared/progress'
import {
  AssignmentExceptionEntity,
  AssignmentRecipientEntity,
  AttemptEntity,
  EnrollmentEntity,
  type AssignmentExceptionRow,
  type AssignmentRow,
} from '../entities'

/** One (assignment, apprentice) pair summed up by the database. */
export interface PairTally {
  tally: AttemptTally
  lastActivity: string | null
  inProgressAttemptId: string | null
}

export const NO_TALLY: PairTally = { tally: NO_ATTEMPTS, lastActivity: null, inProgressAttemptId: null }

export interface Standing {
  status: WorkStatus
  /** Submitted, graded attempts. */
  attempts: number
  /** The score that counts (late penalty applied; 0 for missed work never graded). */
  bestScore: number | null
  /** Whether it is part of their average. */
  counts: boolean
  passed: boolean
  /** A graded score at or above the pass mark that did not pass: a required objective was missed. */
  bestRaw: number | null
  lastActivity: string | null
  inProgressAttemptId: string | null
  terms: PersonalTerms
}

export const pairKey = (assignmentId: string, userId: string) => `${assignmentId}:${userId}`

/** An assignment row's terms; rows set before late policies existed accept late work without penalty. */
export function assignmentTerms(row: AssignmentRow): AssignmentTerms {
  return {
    opensAt: row.opensAt,
    dueAt: row.dueAt,
    attemptLimit: row.attemptLimit,
    latePolicy: row.latePolicy ?? 'acceptLate',
    latePenalty: row.latePenalty ?? 0,
  }
}

const num = (value: unknown) => (value === null || value === undefined ? null : Number(value))

/**
 * Attempt tallies on the given assignments (of one apprentice, if `userId` is given), keyed by pairKey;
 * pairs with no attempt are absent (NO_TALLY). The database sums each pair up from the covering index
 * `idx_attempts_gradebook`, on-time and late attempts apart, so one row per pair crosses into JavaScript
 * rather than one per attempt. Only submitted attempts with a score count as graded.
 */
export async function attemptTallies(
  ds: DataSource | EntityManager,
  assignmentIds: string[],
  userId?: string,
): Promise<Map<string, PairTally>> {
  const tallies = new Map<string, PairTally>()
  if (assignmentIds.length === 0) return tallies
  const graded = `attempt.status = 'submitted' AND attempt.score IS NOT NULL`
  const query = ds
    .getRepository(AttemptEntity)
    .createQueryBuilder('attempt')
    .select('attempt.assignmentId', 'assignmentId')
    .addSelect('attempt.userId', 'userId')
    .addSelect(`SUM(CASE WHEN ${graded} THEN 1 ELSE 0 END)`, 'submitted')
    .addSelect(`MAX(CASE WHEN ${graded} AND NOT attempt.late THEN attempt.score END)`, 'bestOnTime')
    .addSelect(`MAX(CASE WHEN ${graded} AND attempt.late THEN attempt.score END)`, 'bestLate')
    // CASE, not MAX(boolean): PostgreSQL has no MAX for booleans, SQLite stores them as 0/1.
    .addSelect(
      `MAX(CASE WHEN ${graded} AND attempt.passed AND NOT attempt.late THEN 1 ELSE 0 END)`,
      'passedOnTime',
    )
    .addSelect(`MAX(CASE WHEN ${graded} AND attempt.passed AND attempt.late THEN 1 ELSE 0 END)`, 'passedLate')
    .addSelect('MAX(attempt.updatedAt)', 'lastActivity')
    .addSelect(`MIN(CASE WHEN attempt.status = 'inProgress' THEN attempt.id END)`, 'inProgressAttemptId')
    .where('attempt.assignmentId IN (:...assignmentIds)', { assignmentIds })
    .groupBy('attempt.assignmentId')
    .addGroupBy('attempt.userId')
  if (userId) query.andWhere('attempt.userId = :userId', { userId })
  const raw: Record<string, unknown>[] = await query.getRawMany()
  for (const r of raw) {
    // PostgreSQL returns SUM as a bigint string; both drivers may return numbers as text, so coerce.
    const inProgressAttemptId = (r.inProgressAttemptId as string | null) ?? null
    tallies.set(pairKey(String(r.assignmentId), String(r.userId)), {
      tally: {
        submitted: Number(r.submitted),
        bestOnTime: num(r.bestOnTime),
        bestLate: num(r.bestLate),
        passedOnTime: Number(r.passedOnTime) === 1,
        passedLate: Number(r.passedLate) === 1,
        inProgress: inProgressAttemptId !== null,
      },
      lastActivity: (r.lastActivity as string | null) ?? null,
      inProgressAttemptId,
    })
  }
  return tallies
}

/** What the rules need to know about each apprentice on each assignment, read in three queries. */
export interface ApprenticeFactsIndex {
  facts(assignment: AssignmentRow, userId: string): ApprenticeFacts
  /** When the apprentice enrolled in the cohort (absent: not a member). */
  enrolledAt(cohortId: string, userId: string): string | undefined
  exception(assignmentId: string, userId: string): AssignmentExceptionRow | undefined
}

export async function apprenticeFacts(
  ds: DataSource | EntityManager,
  assignments: AssignmentRow[],
  userId?: string,
): Promise<ApprenticeFactsIndex> {
  const assignmentIds = assignments.map((a) => a.id)
  const cohortIds = [...new Set(assignments.map((a) => a.cohortId))]
  const byUser = userId ? { userId } : {}
  const enrolments = cohortIds.length
    ? await ds.getRepository(EnrollmentEntity).find({
        where: { cohortId: In(cohortIds), ...byUser },
        select: { cohortId: true, userId: true, createdAt: true },
      })
    : []
  const exceptions = assignmentIds.length
    ? await ds.getRepository(AssignmentExceptionEntity).findBy({ assignmentId: In(assignmentIds), ...byUser })
    : []
  const targeted = assignments.filter((a) => a.audience === 'selected').map((a) => a.id)
  const recipients = targeted.length
    ? await ds.getRepository(AssignmentRecipientEntity).find({
        where: { assignmentId: In(targeted), ...byUser },
        select: { assignmentId: true, userId: true },
      })
    : []
  const enrolledAt = new Map(enrolments.map((e) => [`${e.cohortId}:${e.userId}`, e.createdAt]))
  const exceptionOf = new Map(exceptions.map((e) => [pairKey(e.assignmentId, e.userId), e]))
  const recipient = new Set(recipients.map((r) => pairKey(r.assignmentId, r.userId)))
  return {
    enrolledAt: (cohortId, uid) => enrolledAt.get(`${cohortId}:${uid}`),
    exception: (assignmentId, uid) => exceptionOf.get(pairKey(assignmentId, uid)),
    facts(assignment, uid) {
      const exception = exceptionOf.get(pairKey(assignment.id, uid))
      return {
        // A former member's work keeps the assignment's own dates.
        enrolledAt: enrolledAt.get(`${assignment.cohortId}:${uid}`) ?? assignment.createdAt,
        assigned: assignment.audience !== 'selected' || recipient.has(pairKey(assignment.id, uid)),
        exception: exception
          ? {
              dueAt: exception.dueAt,
              extraAttempts: exception.extraAttempts,
              excused: Boolean(exception.excused),
            }
          : null,
      }
    },
  }
}

/** One pair's standing from its terms and tally, at `now`. */
export function standingOf(terms: PersonalTerms, pair: PairTally, now: string): Standing {
  const { status, score, counts } = workStanding(terms, pair.tally, now)
  const { bestOnTime, bestLate } = pair.tally
  return {
    status,
    attempts: pair.tally.submitted,
    bestScore: score,
    counts,
    passed: pair.tally.passedOnTime || pair.tally.passedLate,
    bestRaw: bestOnTime === null ? bestLate : bestLate === null ? bestOnTime : Math.max(bestOnTime, bestLate),
    lastActivity: pair.lastActivity,
    inProgressAttemptId: pair.inProgressAttemptId,
    terms,
  }
}

/**
 * The standing of apprentices on assignments, keyed by pairKey: `people` names who, per assignment (the
 * members of its cohort, say), or is the same list for every assignment.
 */
export async function standingsFor(
  ds: DataSource | EntityManager,
  assignments: AssignmentRow[],
  people: string[] | ((assignment: AssignmentRow) => string[]),
  now: string,
  onlyUser?: string,
): Promise<Map<string, Standing>> {
  const ids = assignments.map((a) => a.id)
  const tallies = await attemptTallies(ds, ids, onlyUser)
  const facts = await apprenticeFacts(ds, assignments, onlyUser)
  const standings = new Map<string, Standing>()
  for (const assignment of assignments) {
    const terms = assignmentTerms(assignment)
    for (const userId of typeof people === 'function' ? people(assignment) : people) {
      const key = pairKey(assignment.id, userId)
      standings.set(
        key,
        standingOf(personalTerms(terms, facts.facts(assignment, userId)), tallies.get(key) ?? NO_TALLY, now),
      )
    }
  }
  return standings
}
