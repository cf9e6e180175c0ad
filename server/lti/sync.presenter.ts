// A grade's way to the platform (lti_score_syncs row) → the gradebook cell's sync state.
import type { ScoreSyncCell } from '@shared/api/lti'
import type { LtiScoreSyncRow } from '../entities'

export const presentScoreSync = (row: LtiScoreSyncRow): ScoreSyncCell => ({
  assignmentId: row.assignmentId,
  userId: row.userId,
  state: row.state,
  score: row.score,
  tries: row.tries,
  problem: row.problem,
  updatedAt: row.updatedAt,
})
