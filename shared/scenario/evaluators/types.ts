// What an objective evaluator receives and returns.
import type { ObjectiveKind, ObjectiveOf } from '../objectiveSchema'
import type { AttemptTrace } from '../samples'
import type { Scenario } from '../schema'

export interface Verdict {
  met: boolean
  /** Plain words: the simulated time and the values that met or missed the objective. */
  evidence: string
  /** Simulated time (ms) the evidence refers to, when there is one moment. */
  at?: number
}

export interface EvaluationContext {
  scenario: Scenario
  trace: AttemptTrace
}

export type Evaluator<K extends ObjectiveKind> = (
  objective: ObjectiveOf<K>,
  context: EvaluationContext,
) => Verdict
