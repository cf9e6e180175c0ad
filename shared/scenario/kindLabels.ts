// Objective kinds and safety-violation kinds in plain words, for a column, a filter or a heading.
// Kept apart from names.ts so a page can name kinds without loading the drive model.
import type { SafetyViolation } from '../api/grading'
import type { ObjectiveKind } from './objectiveSchema'

const OBJECTIVE_KIND_LABELS: Record<ObjectiveKind, string> = {
  settingEquals: 'Drive setting',
  settingInRange: 'Drive setting within limits',
  wiringCondition: 'Input wiring',
  functionalCheck: 'Function test',
  speedHeld: 'Speed held',
  stoppedBy: 'Stopping method',
  restartedWithRememberedReference: 'Restart at the remembered speed',
  noWiringWhileEnergised: 'No work on live terminals',
  lockBeforeWiring: 'Locked off before work',
  absenceOfVoltageProved: 'Absence of voltage proved',
  isolated: 'Left isolated',
  noFaultTrips: 'No fault trips',
  noAlarms: 'No alarms left showing',
  faultFoundAndCleared: 'Fault found and put right',
  finishedWithin: 'Finished in time',
  diagnosisCorrect: 'Diagnosis correct',
  discriminatingMeasurement: 'Measured before repairing',
  noNeedlessReplacements: 'No needless replacements',
}

export function objectiveKindLabel(kind: ObjectiveKind): string {
  return OBJECTIVE_KIND_LABELS[kind]
}

const VIOLATION_KIND_LABELS: Record<SafetyViolation['kind'], string> = {
  workWhileEnergised: 'Work on live terminals',
  workWithoutLock: 'Work without a lock',
  workWithoutProvingDead: 'Work before proving dead',
  ohmmeterOnLiveCircuit: 'Resistance or continuity tested on a live circuit',
}

export function safetyViolationKindLabel(kind: SafetyViolation['kind']): string {
  return VIOLATION_KIND_LABELS[kind]
}
