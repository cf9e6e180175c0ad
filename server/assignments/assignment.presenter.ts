// An assignment row → the API's Assignment (names for ids, and the apprentice's own standing when the viewer
// is one); the statistics of its best scores → AssignmentStats.
import type { Assignment, AssignmentStats } from '@shared/api/assignments'
import type { AssignmentRow } from '../entities'
import type { Standing } from '../gradebook/standings'
import { histogram, mean, median } from './stats'

export const presentAssignment = (
  row: AssignmentRow,
  related: { cohortName: string; scenario: { key: string; version: number }; mine?: Standing },
): Assignment => ({
  id: row.id,
  cohortId: row.cohortId,
  cohortName: related.cohortName,
  scenarioId: row.scenarioId,
  scenarioKey: related.scenario.key,
  scenarioVersion: related.scenario.version,
  title: row.title,
  opensAt: row.opensAt,
  dueAt: row.dueAt,
  attemptLimit: row.attemptLimit,
  hintsAllowed: Boolean(row.hintsAllowed),
  scorePolicy: row.scorePolicy,
  createdAt: row.createdAt,
  myProgress: related.mine
    ? {
        attemptsUsed: related.mine.attempts,
        bestScore: related.mine.bestScore,
        passed: related.mine.passed,
        inProgressAttemptId: related.mine.inProgressAttemptId,
      }
    : null,
})

/** Statistics over each enrolled apprentice's standing; only graded apprentices count towards scores. */
export function presentAssignmentStats(assignmentId: string, standings: Standing[]): AssignmentStats {
  const graded = standings.filter((s) => s.bestScore !== null)
  const best = graded.map((s) => s.bestScore!)
  return {
    assignmentId,
    apprentices: standings.length,
    attempted: graded.length,
    mean: mean(best),
    median: median(best),
    passRate: graded.length ? graded.filter((s) => s.passed).length / graded.length : null,
    histogram: histogram(best),
  }
}
