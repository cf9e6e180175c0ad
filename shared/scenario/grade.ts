// grade(scenario, events): replays an attempt through the model and scores it against the
// scenario's objectives (the rule is in score.ts). Pure and deterministic; the server calls it as the
// authority. It is the live grader fed the whole log: one definition of every objective.
import type { AttemptEvent } from '../model'
import type { GradeResult } from '../api/grading'
import { assertEndAt, assertEventTime, createLiveGrader } from './liveGrader'
import type { AssistanceLevel } from './assistance'
import type { Scenario } from './schema'

export type { GradeResult, HintUse, ObjectiveResult, SafetyViolation } from '../api/grading'
export { GradeInputError } from './liveGrader'

export interface GradeOptions {
  /** Judge at this simulated time (ms) instead of the last event: the panel's live view. */
  endAt?: number
  /** The attempt's assistance level: a guided attempt's hints cost nothing (default standard). */
  assistance?: AssistanceLevel
}

export function grade(
  scenario: Scenario,
  events: readonly AttemptEvent[],
  options: GradeOptions = {},
): GradeResult {
  // Every input problem is reported before any replay work.
  events.forEach((event, index) => assertEventTime(event, index, index > 0 ? events[index - 1]!.t : 0))
  assertEndAt(options.endAt)
  return createLiveGrader(scenario, events, { assistance: options.assistance }).result(options.endAt)
}
