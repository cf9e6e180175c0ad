// Authoritative grading: replays the stored log against the scenario version with the shared grader.
import { ModelInputError, type AttemptEvent } from '@shared/model'
import { grade, type GradeResult } from '@shared/scenario/grade'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Scenario } from '@shared/scenario/schema'
import { HttpError } from '../../http-error'

export interface GradeOutcome {
  score: number // 0–100
  passed: boolean
  evidence: GradeResult
}

/** A grading result that can cross a thread boundary: an outcome, or why the log cannot be replayed. */
export type GradeReport = { ok: true; outcome: GradeOutcome } | { ok: false; inputError: string }

/** Grades a log; a log the model cannot replay (an event naming a device the scenario lacks …) is reported. */
export function gradeReport(
  scenario: Scenario,
  events: AttemptEvent[],
  assistance?: AssistanceLevel,
): GradeReport {
  try {
    const result = grade(scenario, events, { assistance })
    return { ok: true, outcome: { score: result.score, passed: result.passed, evidence: result } }
  } catch (error) {
    if (error instanceof ModelInputError) return { ok: false, inputError: error.message }
    throw error
  }
}

/** A log the model cannot replay is the client's mistake: 400, naming why. */
export const unreplayableLog = (inputError: string) =>
  new HttpError(400, 'validation_failed', `The event log cannot be replayed: ${inputError}`, {
    fields: { events: [inputError] },
  })

/** The outcome of a report; an unreplayable log is the client's mistake: 400. */
export function outcomeOf(report: GradeReport): GradeOutcome {
  if (report.ok) return report.outcome
  throw unreplayableLog(report.inputError)
}

/** Grades on the calling thread (seeding, benchmarks, tests); the API grades through a GradingPool. */
export function gradeAttempt(
  scenario: Scenario,
  events: AttemptEvent[],
  assistance?: AssistanceLevel,
): GradeOutcome {
  return outcomeOf(gradeReport(scenario, events, assistance))
}
