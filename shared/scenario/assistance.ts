// Assistance levels: how much help an attempt gets beyond what a real bench shows. The instructor sets it on
// an assignment, the apprentice chooses it for practice, and each attempt keeps the level it was started at.
// Standard is the default: a real bench (the drive's display and lamps, the meter) plus hints at their cost.
import { z } from 'zod'

export const ASSISTANCE_LEVEL_KEYS = ['guided', 'standard', 'assessment'] as const
export type AssistanceLevel = (typeof ASSISTANCE_LEVEL_KEYS)[number]

export const DEFAULT_ASSISTANCE_LEVEL: AssistanceLevel = 'standard'

export interface AssistanceLevelInfo {
  label: string
  /** One line for the people choosing it. */
  description: string
}

export const ASSISTANCE_LEVEL_INFO: Record<AssistanceLevel, AssistanceLevelInfo> = {
  guided: {
    label: 'Guided',
    description:
      'Learning the bench: live readings of the bus and every input, alarms say how to put things right, hints cost nothing.',
  },
  standard: {
    label: 'Standard',
    description:
      'A real bench: only the drive’s display and lamps and the meter; alarms say what is wrong, the fix only through a hint at its cost.',
  },
  assessment: {
    label: 'Assessment',
    description:
      'Working unaided: a real bench with no hints and no objective ticks while working; the grade shows at the end.',
  },
}

/** "Standard", for people; never the key. */
export function assistanceLabel(level: AssistanceLevel): string {
  return ASSISTANCE_LEVEL_INFO[level].label
}

export const assistanceLevelSchema = z.enum(ASSISTANCE_LEVEL_KEYS, {
  error: 'Choose an assistance level: guided, standard or assessment',
})

/** What a level lets the panel show and how the grade treats a hint. */
export interface AssistanceRules {
  /** The Live values tab (bus and input volts and milliamps: more than a real bench shows). */
  liveValues: boolean
  /** Alarms and faults name the fix, not only what is wrong. */
  alarmFix: boolean
  /** Hints can be revealed. */
  hints: boolean
  /** Objectives are ticked off while working. */
  liveTicks: boolean
  /** A revealed hint costs its points. */
  hintsCost: boolean
}

export function assistanceRules(level: AssistanceLevel): AssistanceRules {
  return {
    liveValues: level === 'guided',
    alarmFix: level === 'guided',
    hints: level !== 'assessment',
    liveTicks: level !== 'assessment',
    hintsCost: level !== 'guided',
  }
}

/** The points a revealed hint takes off at this level (guided hints are free). */
export function hintCostAt(level: AssistanceLevel, cost: number): number {
  return assistanceRules(level).hintsCost ? cost : 0
}

/** The level an assignment made before levels existed stands for: no hints was an assessment. */
export function levelFromHintsAllowed(hintsAllowed: boolean): AssistanceLevel {
  return hintsAllowed ? 'standard' : 'assessment'
}
