// Per-apprentice standing on assignments, computed from attempts: best score, count, last activity, status.
import type { DataSource } from 'typeorm'
import { In } from 'typeorm'
import type { GradebookCellStatus } from '@shared/api/gradebook'
import { AttemptEntity, type AttemptRow } from '../entities'

export interface Standing {
  attempts: number // submitted attempts
  bestScore: number | null
  passed: boolean
  lastActivity: string | null
  inProgressAttemptId: string | null
  status: GradebookCellStatus
}

export function standingOf(attempts: AttemptRow[]): Standing {
  const submitted = attempts.filter((a) => a.status === 'submitted' && a.score !== null)
  const inProgress = attempts.find((a) => a.status === 'inProgress') ?? null
  const bestScore = submitted.length ? Math.max(...submitted.map((a) => a.score!)) : null
  const passed = submitted.some((a) => Boolean(a.passed))
  const lastActivity = attempts.reduce<string | null>(
    (latest, a) => (!latest || a.updatedAt > latest ? a.updatedAt : latest),
    null,
  )
  const status: GradebookCellStatus = passed
    ? 'passed'
    : submitted.length
      ? 'failed'
      : inProgress
        ? 'inProgress'
        : 'notStarted'
  return {
    attempts: submitted.length,
    bestScore,
    passed,
    lastActivity,
    inProgressAttemptId: inProgress?.id ?? null,
    status,
  }
}

/** Attempts on the given assignments, grouped by `${assignmentId}:${userId}`. */
export async function attemptsByAssignmentAndUser(ds: DataSource, assignmentIds: string[]) {
  const groups = new Map<string, AttemptRow[]>()
  if (assignmentIds.length === 0) return groups
  const rows = await ds.getRepository(AttemptEntity).find({
    where: { assignmentId: In(assignmentIds) },
    select: {
      id: true,
      userId: true,
      assignmentId: true,
      status: true,
      score: true,
      passed: true,
      updatedAt: true,
      submittedAt: true,
    },
  })
  for (const row of rows) {
    const key = `${row.assignmentId}:${row.userId}`
    groups.set(key, [...(groups.get(key) ?? []), row])
  }
  return groups
}
