// One evaluator per objective kind.
import type { Objective, ObjectiveKind } from '../objectiveSchema'
import { functionalCheck } from './functional'
import { faultFoundAndCleared, finishedWithin, noAlarms, noFaultTrips } from './outcomes'
import { absenceOfVoltageProved, isolated, lockBeforeWiring, noWiringWhileEnergised } from './safePractice'
import { settingEquals, settingInRange } from './settings'
import { speedHeld } from './speed'
import { restartedWithRememberedReference, stoppedBy } from './stopping'
import type { EvaluationContext, Evaluator, Verdict } from './types'
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
}

export function evaluate(objective: Objective, context: EvaluationContext): Verdict {
  const evaluator = evaluators[objective.kind] as Evaluator<typeof objective.kind>
  return evaluator(objective as never, context)
}

export type { EvaluationContext, Verdict } from './types'
