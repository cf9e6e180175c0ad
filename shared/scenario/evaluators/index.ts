// One evaluator per objective kind.
import type { Objective, ObjectiveKind } from '../objectiveSchema'
import { functionalCheck } from './functional'
import { diagnosisCorrect, discriminatingMeasurement, noNeedlessReplacements } from './method'
import { faultFoundAndCleared, finishedWithin, noAlarms, noFaultTrips } from './outcomes'
import { absenceOfVoltageProved, isolated, lockBeforeWiring, noWiringWhileEnergised } from './safePractice'
import { settingEquals, settingInRange } from './settings'
import { speedHeld } from './speed'
import { restartedWithRememberedReference, stoppedBy } from './stopping'
import type { EvaluationContext, Evaluator, Folding } from './types'
import { wiringCondition } from './wiring'

const evaluators: { [K in ObjectiveKind]: Evaluator<K> } = {
  settingEquals,
  settingInRange,
  wiringCondition,
  functionalCheck,
  speedHeld,
  stoppedBy,
  restartedWithRememberedReference,
  noWiringWhileEnergised,
  lockBeforeWiring,
  absenceOfVoltageProved,
  isolated,
  noFaultTrips,
  noAlarms,
  faultFoundAndCleared,
  finishedWithin,
  diagnosisCorrect,
  discriminatingMeasurement,
  noNeedlessReplacements,
}

/** The running judgement of one objective, to be stepped with every sample from the start. */
export function startObjective(objective: Objective, context: EvaluationContext): Folding {
  const evaluator = evaluators[objective.kind] as Evaluator<typeof objective.kind>
  return evaluator(objective as never, context)
}

export type { EvaluationContext, Folding, Verdict } from './types'
