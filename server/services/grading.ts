// Authoritative grading: replays the stored log against the scenario version with the shared grader.
import { ModelInputError, type AttemptEvent } from '@shared/model'
import { grade, type GradeResult } from '@shared/scenario/grade'
import type { Scenario } from '@shared/scenario/schema'
import { HttpError } from '../http-error'

export interface GradeOutcome {
  score: number // 0–100
  passed: boolean
  evidence: GradeResult
}

/** A log the model cannot replay (an event naming a device the scenario lacks …) is the client's mistake. */
export function gradeAttempt(scenario: Scenario, events: AttemptEvent[]): GradeOutcome {
  try {
    const result = grade(scenario, events)
    return { score: result.score, passed: result.passed, evidence: result }
  } catch (error) {
    if (error instanceof ModelInputError) {
      throw new HttpError(400, 'validation_failed', `The event log cannot be replayed: ${error.message}`, {
        fields: { events: [error.message] },
      })
    }
    throw error
  }
}
