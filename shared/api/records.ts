// Records that leave the building: the commissioning record of an attempt (PDF), the training record of an
// apprentice (JSON for the screens, PDF to file), a cohort's training records (zip), and an instructor's
// sign-off of a learning outcome.
import { z } from 'zod'
import { idSchema } from './common'

/** Which of the apprentice's cohorts the training record covers; absent = every cohort the caller may read. */
export const trainingRecordQuerySchema = z.object({ cohortId: idSchema.optional() })
export type TrainingRecordQuery = z.infer<typeof trainingRecordQuerySchema>

export const signOffRequestSchema = z.object({
  /** The cohort in which the instructor signs off (they must teach it; the apprentice must be in it). */
  cohortId: idSchema,
  scenarioKey: z.string().trim().min(1, { error: 'Choose an exercise' }).max(80),
  outcome: z.string().trim().min(1, { error: 'Choose a learning outcome' }).max(500),
  note: z
    .string()
    .trim()
    .min(1, { error: 'Write a note: what you saw the apprentice do' })
    .max(2000, { error: 'At most 2000 characters' }),
})
export type SignOffRequest = z.infer<typeof signOffRequestSchema>

export const outcomeSignOffSchema = z.object({
  id: idSchema,
  cohortId: idSchema,
  byName: z.string(),
  at: z.string(),
  note: z.string(),
})
export type OutcomeSignOff = z.infer<typeof outcomeSignOffSchema>

/** Withdrawing a sign-off: the instructor says why (kept with it and in the audit trail). */
export const signOffWithdrawalRequestSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(1, { error: 'Say why the sign-off is withdrawn' })
    .max(2000, { error: 'At most 2000 characters' }),
})
export type SignOffWithdrawalRequest = z.infer<typeof signOffWithdrawalRequestSchema>

/** A sign-off that was withdrawn: the sign-off as it was, and who withdrew it, when and why. */
export const withdrawnSignOffSchema = outcomeSignOffSchema.extend({
  withdrawnByName: z.string(),
  withdrawnAt: z.string(),
  reason: z.string(),
})
export type WithdrawnSignOff = z.infer<typeof withdrawnSignOffSchema>

export const trainingOutcomeSchema = z.object({
  scenarioKey: z.string(),
  scenarioTitle: z.string(),
  outcome: z.string(),
  /** The first passed attempt on the exercise, or null while none has passed. */
  shownBy: z
    .object({ attemptId: idSchema, attemptLabel: z.string(), at: z.string(), score: z.number() })
    .nullable(),
  signOff: outcomeSignOffSchema.nullable(),
  /** Sign-offs of this outcome that were withdrawn, oldest first. */
  withdrawnSignOffs: z.array(withdrawnSignOffSchema),
})
export type TrainingOutcome = z.infer<typeof trainingOutcomeSchema>

export const trainingRecordSummarySchema = z.object({
  apprentice: z.object({ id: idSchema, name: z.string() }),
  cohorts: z.array(z.object({ id: idSchema, name: z.string() })),
  outcomes: z.array(trainingOutcomeSchema),
  attempts: z.number().int().nonnegative(),
  safetyViolations: z.number().int().nonnegative(),
})
export type TrainingRecordSummary = z.infer<typeof trainingRecordSummarySchema>

/**
 * A commissioning record for the browser's print view: the view model the PDF is made from, with every
 * date and time already written in words in the centre's time zone (as the PDF prints them).
 */
const objectiveLineSchema = z.object({
  title: z.string(),
  required: z.boolean(),
  safety: z.boolean(),
  met: z.boolean(),
  pointsEarned: z.number(),
  pointsPossible: z.number(),
  evidence: z.string(),
})

export const commissioningRecordSchema = z.object({
  centre: z.object({ name: z.string(), timeZone: z.string(), locale: z.string().optional() }),
  generated: z.string(),
  scenario: z.object({ title: z.string(), version: z.number(), site: z.string(), machine: z.string() }),
  apprentice: z.object({ name: z.string() }),
  instructor: z.object({ name: z.string() }).nullable(),
  attempt: z.object({
    label: z.string(),
    started: z.string(),
    submitted: z.string().nullable(),
    /** Simulated time on the bench, e.g. "12 min 30 s". */
    timeOnBench: z.string(),
    /** In words, e.g. "Assessment (no extra help)". */
    assistance: z.string(),
  }),
  result: z.object({
    score: z.number(),
    passed: z.boolean(),
    autoScore: z.number(),
    autoPassed: z.boolean(),
    points: z.object({
      earned: z.number(),
      hintCost: z.number(),
      net: z.number(),
      possible: z.number(),
      passMark: z.number(),
    }),
    summary: z.string(),
  }),
  objectives: z.array(objectiveLineSchema),
  /** `at`: time into the attempt, e.g. "01:27.2". */
  hintsUsed: z.array(z.object({ text: z.string(), at: z.string(), cost: z.number() })),
  safetyViolations: z.array(z.object({ at: z.string(), text: z.string() })),
  schematic: z.object({ svg: z.string(), width: z.number(), height: z.number() }),
  trendSvg: z.string(),
  wires: z.array(z.object({ number: z.string(), colour: z.string(), from: z.string(), to: z.string() })),
  settings: z.array(
    z.object({
      group: z.string(),
      label: z.string(),
      value: z.string(),
      defaultValue: z.string(),
      changedFromDefault: z.boolean(),
      changedInAttempt: z.boolean(),
    }),
  ),
  unsavedSettings: z.array(z.object({ label: z.string(), value: z.string() })),
  review: z.object({
    feedback: z.array(z.object({ author: z.string(), at: z.string(), body: z.string() })),
    override: z
      .object({
        by: z.string(),
        at: z.string(),
        from: z.object({ score: z.number(), passed: z.boolean() }),
        to: z.object({ score: z.number(), passed: z.boolean() }),
        reason: z.string(),
      })
      .nullable(),
  }),
})
export type CommissioningRecord = z.infer<typeof commissioningRecordSchema>
