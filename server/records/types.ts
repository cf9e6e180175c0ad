// The plain view models the two PDF builders take. Everything is already in words a reader sees (no
// internal ids); instants are ISO 8601 strings, printed in the centre's time zone.
import type { ObjectiveResult } from '@shared/scenario'
import type { AssistanceLevel } from './format'

export interface RecordCentre {
  name: string
  /** IANA time zone the record's dates are printed in, e.g. "Europe/London". */
  timeZone: string
  /** BCP 47 locale for dates; default "en-GB". */
  locale?: string
}

export interface RecordPerson {
  name: string
}

/** One objective as graded (shared/scenario), without its internal id. */
export type ObjectiveLine = Pick<
  ObjectiveResult,
  'title' | 'required' | 'safety' | 'met' | 'pointsEarned' | 'pointsPossible' | 'evidence'
>

export interface SettingLine {
  /** The catalogue group, e.g. "Ramps and stopping". */
  group: string
  label: string
  value: string
  defaultValue: string
  changedFromDefault: boolean
  /** Different from what the drive held when the attempt began. */
  changedInAttempt: boolean
}

export interface TrendPoint {
  /** Simulated ms from the start of the attempt. */
  tMs: number
  /** Speed reference in Hz, or null while the drive's electronics are dark. */
  referenceHz: number | null
  /** Output frequency in Hz (the motor's speed). */
  outputHz: number
}

export interface CommissioningTrend {
  endMs: number
  points: TrendPoint[]
  /** Shaft rpm per Hz of output (from the motor nameplate settings), for the second axis. */
  rpmPerHz: number
}

export interface WireLine {
  number: string
  colour: string
  from: string
  to: string
}

export interface FeedbackLine {
  author: string
  at: string
  body: string
}

export interface GradeOverrideLine {
  by: string
  at: string
  from: { score: number; passed: boolean }
  to: { score: number; passed: boolean }
  reason: string
}

export interface CommissioningRecordView {
  centre: RecordCentre
  generatedAt: string
  scenario: { title: string; version: number; site: string; machine: string }
  apprentice: RecordPerson
  /** The instructor who reviews the attempt, when there is one. */
  instructor: RecordPerson | null
  attempt: {
    /** Plain words, e.g. "Attempt 2". */
    label: string
    startedAt: string
    submittedAt: string | null
    simulatedMs: number
    assistance: AssistanceLevel
  }
  result: {
    /** The score that counts: the instructor's override if any, else the grader's. */
    score: number
    passed: boolean
    autoScore: number
    autoPassed: boolean
    points: { earned: number; hintCost: number; net: number; possible: number; passMark: number }
    summary: string
  }
  objectives: ObjectiveLine[]
  hintsUsed: { text: string; atMs: number; cost: number }[]
  safetyViolations: { atMs: number; text: string }[]
  /** The as-wired schematic at submission (shared/schematic), with its size in px. */
  schematic: { svg: string; width: number; height: number }
  wires: WireLine[]
  settings: SettingLine[]
  /** Edited on the keypad but never saved: not in the drive. */
  unsavedSettings: { label: string; value: string }[]
  trend: CommissioningTrend
  review: { feedback: FeedbackLine[]; override: GradeOverrideLine | null }
}

export interface OutcomeLine {
  outcome: string
  scenarioTitle: string
  /** The attempt that showed the outcome, or null when none has yet. */
  shownBy: { attemptLabel: string; at: string; score: number } | null
  signOff: { by: string; at: string; note: string } | null
  /** Sign-offs taken back, oldest first: who signed and when, who withdrew it, when and why. */
  withdrawn: { by: string; at: string; withdrawnBy: string; withdrawnAt: string; reason: string }[]
}

export interface AttemptLine {
  scenarioTitle: string
  attemptLabel: string
  submittedAt: string
  score: number
  passed: boolean
  overridden: boolean
  safetyViolations: number
}

export interface SafetyLine {
  scenarioTitle: string
  attemptLabel: string
  /** When the attempt was submitted. */
  at: string
  /** Simulated time of the unsafe act within the attempt. */
  atMs: number
  text: string
}

export interface TrainingRecordView {
  centre: RecordCentre
  generatedAt: string
  apprentice: RecordPerson
  cohorts: string[]
  instructor: RecordPerson | null
  outcomes: OutcomeLine[]
  attempts: AttemptLine[]
  safety: SafetyLine[]
}
