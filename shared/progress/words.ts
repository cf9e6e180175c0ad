// The words people read for progress: on screen, in CSV files and in mail (never the identifiers).
import type { LatePolicy, WorkStatus } from './standing'

export const WORK_STATUS_LABELS: Record<WorkStatus, string> = {
  notStarted: 'Not started',
  inProgress: 'In progress',
  failed: 'Not passed',
  passed: 'Passed',
  late: 'Passed late',
  missed: 'Missed',
  excused: 'Excused',
  notAssigned: 'Not set',
}

export const LATE_POLICY_LABELS: Record<LatePolicy, string> = {
  closeAtDue: 'Closes at the due date',
  acceptLate: 'Accepts late work',
}

/** "Accepts late work, 10 points off" / "Closes at the due date". */
export function latePolicyText(policy: LatePolicy, penalty: number): string {
  if (policy === 'closeAtDue') return LATE_POLICY_LABELS.closeAtDue
  return penalty > 0
    ? `${LATE_POLICY_LABELS.acceptLate}, ${penalty} points off`
    : LATE_POLICY_LABELS.acceptLate
}

/** The rule for passing, in one sentence, from the pass mark as a score (0–100). */
export function passRuleText(passMark: number | null, requiredObjectives: number): string {
  const mark = passMark === null ? 'the pass mark' : `a score of ${passMark}`
  return requiredObjectives > 0
    ? `Pass: ${mark} or more, and every required objective met (${requiredObjectives})`
    : `Pass: ${mark} or more`
}

export const yesNo = (value: boolean) => (value ? 'yes' : 'no')

/** The grader's safety violation kinds (shared/scenario/safety.ts), in words. */
export const SAFETY_VIOLATION_LABELS: Record<string, string> = {
  workWhileEnergised: 'Work on live terminals',
  workWithoutLock: 'Work without a lock applied',
  workWithoutProvingDead: 'Work before proving dead',
  ohmmeterOnLiveCircuit: 'Resistance or continuity tested on a live circuit',
}

export const safetyViolationLabel = (kind: string) => SAFETY_VIOLATION_LABELS[kind] ?? 'Unsafe work'
