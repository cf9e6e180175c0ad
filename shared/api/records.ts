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

export const trainingOutcomeSchema = z.object({
  scenarioKey: z.string(),
  scenarioTitle: z.string(),
  outcome: z.string(),
  /** The first passed attempt on the exercise, or null while none has passed. */
  shownBy: z
    .object({ attemptId: idSchema, attemptLabel: z.string(), at: z.string(), score: z.number() })
    .nullable(),
  signOff: outcomeSignOffSchema.nullable(),
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
