// An assignment row → the API's Assignment (names for ids, and the apprentice's own standing when the viewer
// is one); the statistics of its best scores → AssignmentStats.
import type { Assignment, AssignmentStats } from '@shared/api/assignments'
import type { AssignmentRow } from '../entities'
import { assignmentTerms, type Standing } from '../gradebook/standings'
import { histogram, mean, median } from './stats'

export const presentAssignment = (
  row: AssignmentRow,
  related: { cohortName: string; scenario: { key: string; version: number; title: string }; mine?: Standing },
): Assignment => {
  const terms = assignmentTerms(row)
  const mine = related.mine
  return {
    id: row.id,
    cohortId: row.cohortId,
    cohortName: related.cohortName,
    scenarioId: row.scenarioId,
    scenarioKey: related.scenario.key,
    scenarioTitle: related.scenario.title,
    scenarioVersion: related.scenario.version,
    title: row.title,
    opensAt: row.opensAt,
    dueAt: row.dueAt,
    attemptLimit: row.attemptLimit,
    assistanceLevel: row.assistanceLevel,
    hintsAllowed: row.assistanceLevel !== 'assessment',
    scorePolicy: row.scorePolicy,
    latePolicy: terms.latePolicy,
    latePenalty: terms.latePenalty,
    targeted: row.audience === 'selected',
    createdAt: row.createdAt,
    myProgress: mine
      ? {
          attemptsUsed: mine.attempts,
          bestScore: mine.bestScore,
          passed: mine.passed,
          inProgressAttemptId: mine.inProgressAttemptId,
          status: mine.status,
          dueAt: mine.terms.dueAt,
          attemptLimit: mine.terms.attemptLimit,
          excused: mine.terms.excused,
          extended: mine.terms.extended,
        }
      : null,
  }
}

/**
 * Statistics over the standings of the apprentices the assignment is set for (excused ones left out);
 * only graded apprentices count towards scores; the histogram keeps passes and the rest apart.
 */
export function presentAssignmentStats(
  assignmentId: string,
  standings: Standing[],
  rule: { passMark: number | null; requiredObjectives: number },
): AssignmentStats {
  const set = standings.filter((s) => s.status !== 'excused' && s.status !== 'notAssigned')
  const graded = set.filter((s) => s.attempts > 0 && s.bestScore !== null)
  const best = graded.map((s) => s.bestScore!)
  const all = histogram(best)
  const passes = histogram(graded.filter((s) => s.passed).map((s) => s.bestScore!))
  return {
    assignmentId,
    apprentices: set.length,
    attempted: graded.length,
    mean: mean(best),
    median: median(best),
    passRate: graded.length ? graded.filter((s) => s.passed).length / graded.length : null,
    histogram: all.map((bin, i) => ({ ...bin, passed: passes[i]!.count })),
    passMark: rule.passMark,
    requiredObjectives: rule.requiredObjectives,
  }
}
