// Free practice: which scenarios a cohort leaves open for practice, and how much its apprentices practise.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema, type ErrorCode } from './common'
import { scenarioKeySchema, scenarioLibraryItemSchema } from './scenarios'

/** Every scenario (including ones added later), or only those chosen. */
export const practicePolicySchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('all') }),
  z.object({ mode: z.literal('chosen'), keys: z.array(scenarioKeySchema).max(500) }),
])
export type PracticePolicy = z.infer<typeof practicePolicySchema>

/** One scenario of the library as the cohort's practice page shows it. */
export const cohortPracticeScenarioSchema = z.object({
  key: z.string(),
  title: z.string(),
  difficulty: z.string(),
  open: z.boolean(),
  /** Practice attempts by the cohort's apprentices (any version), and how many of them practised it. */
  attempts: z.number().int().nonnegative(),
  apprentices: z.number().int().nonnegative(),
})

export const cohortPracticeApprenticeSchema = z.object({
  userId: idSchema,
  name: z.string(),
  attempts: z.number().int().nonnegative(),
  submitted: z.number().int().nonnegative(),
  passed: z.number().int().nonnegative(),
  lastAt: isoDateTimeSchema.nullable(),
})

export const cohortPracticeSchema = z.object({
  cohortId: idSchema,
  policy: practicePolicySchema,
  scenarios: z.array(cohortPracticeScenarioSchema),
  /** Every member, by name. */
  apprentices: z.array(cohortPracticeApprenticeSchema),
})
export type CohortPractice = z.infer<typeof cohortPracticeSchema>

/** What the signed-in user may practise: apprentices see only what all of their cohorts leave open. */
export const practiceListSchema = z.object({
  items: z.array(scenarioLibraryItemSchema),
  /** Scenarios an instructor has closed for this apprentice (staff: always 0). */
  closed: z.number().int().nonnegative(),
})
export type PracticeList = z.infer<typeof practiceListSchema>

export const practiceKeyParamsSchema = z.object({ key: scenarioKeySchema })
export const practiceOpenSchema = z.object({ key: z.string(), open: z.literal(true) })

/** The refusal's error code when an apprentice starts or saves practice of a closed scenario. */
export const PRACTICE_CLOSED = 'practice_closed' satisfies ErrorCode
