// Per-apprentice standing on assignments, computed from attempts: best score, count, last activity, status.
import type { DataSource } from 'typeorm'
import type { GradebookCellStatus } from '@shared/api/gradebook'
import { AttemptEntity } from '../entities'

export interface Standing {
  attempts: number // submitted attempts
  bestScore: number | null
  passed: boolean
  lastActivity: string | null
  inProgressAttemptId: string | null
  status: GradebookCellStatus
}

/** The standing of an apprentice with no attempt on an assignment. */
export const NOT_STARTED: Standing = {
  attempts: 0,
  bestScore: null,
  passed: false,
  lastActivity: null,
  inProgressAttemptId: null,
  status: 'notStarted',
}

/** One (assignment, apprentice) pair summed up by the database. */
export interface AttemptTotals {
  submitted: number
  bestScore: number | null
  passed: boolean
  lastActivity: string | null
  inProgressAttemptId: string | null
}

export function standingOf(totals: AttemptTotals): Standing {
  const status: GradebookCellStatus = totals.passed
    ? 'passed'
    : totals.submitted
      ? 'failed'
      : totals.inProgressAttemptId
        ? 'inProgress'
        : 'notStarted'
  return {
    attempts: totals.submitted,
    bestScore: totals.bestScore,
    passed: totals.passed,
    lastActivity: totals.lastActivity,
    inProgressAttemptId: totals.inProgressAttemptId,
    status,
  }
}

/**
 * Standings on the given assignments (of one apprentice, if `userId` is given), keyed by
 * `${assignmentId}:${userId}`; pairs with no attempt are absent (NOT_STARTED). The database sums each pair
 * up from the covering index `idx_attempts_gradebook`, so one row per pair crosses into JavaScript
 * rather than one per attempt. Only submitted attempts with a score count as graded.
 */
export async function standingsByAssignmentAndUser(
  ds: DataSource,
  assignmentIds: string[],
  userId?: string,
): Promise<Map<string, Standing>> {
  const standings = new Map<string, Standing>()
  if (assignmentIds.length === 0) return standings
  const graded = `attempt.status = 'submitted' AND attempt.score IS NOT NULL`
  const query = ds
    .getRepository(AttemptEntity)
    .createQueryBuilder('attempt')
    .select('attempt.assignmentId', 'assignmentId')
    .addSelect('attempt.userId', 'userId')
    .addSelect(`SUM(CASE WHEN ${graded} THEN 1 ELSE 0 END)`, 'submitted')
    .addSelect(`MAX(CASE WHEN ${graded} THEN attempt.score END)`, 'bestScore')
    // CASE, not MAX(boolean): PostgreSQL has no MAX for booleans, SQLite stores them as 0/1.
    .addSelect(`MAX(CASE WHEN ${graded} AND attempt.passed THEN 1 ELSE 0 END)`, 'passed')
    .addSelect('MAX(attempt.updatedAt)', 'lastActivity')
    .addSelect(`MIN(CASE WHEN attempt.status = 'inProgress' THEN attempt.id END)`, 'inProgressAttemptId')
    .where('attempt.assignmentId IN (:...assignmentIds)', { assignmentIds })
    .groupBy('attempt.assignmentId')
    .addGroupBy('attempt.userId')
  if (userId) query.andWhere('attempt.userId = :userId', { userId })
  const raw: Record<string, unknown>[] = await query.getRawMany()
  for (const r of raw) {
    // PostgreSQL returns SUM as a bigint string; both drivers may return numbers as text, so coerce.
    standings.set(
      `${r.assignmentId}:${r.userId}`,
      standingOf({
        submitted: Number(r.submitted),
        bestScore: r.bestScore === null ? null : Number(r.bestScore),
        passed: Number(r.passed) === 1,
        lastActivity: (r.lastActivity as string | null) ?? null,
        inProgressAttemptId: (r.inProgressAttemptId as string | null) ?? null,
      }),
    )
  }
  return standings
}
