// What needs an instructor today, across every cohort they teach: attempts awaiting review, safety
// violations this week, work closing within 48 hours that some have not submitted, and missed work.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema } from './common'

export const ATTENTION_CLOSING_HOURS = 48
export const ATTENTION_SAFETY_DAYS = 7
export const ATTENTION_MISSED_DAYS = 30

const person = z.object({ userId: idSchema, name: z.string() })

export const attentionAttemptSchema = z.object({
  attemptId: idSchema,
  userId: idSchema,
  userName: z.string(),
  cohortId: idSchema,
  cohortName: z.string(),
  assignmentId: idSchema,
  assignmentTitle: z.string(),
  submittedAt: isoDateTimeSchema,
  score: z.number().nullable(),
  passed: z.boolean().nullable(),
  late: z.boolean(),
})
export type AttentionAttempt = z.infer<typeof attentionAttemptSchema>

export const attentionViolationSchema = attentionAttemptSchema.extend({
  /** Each unsafe moment in words (what happened), with its kind as a label. */
  violations: z.array(z.object({ kind: z.string(), text: z.string() })),
})
export type AttentionViolation = z.infer<typeof attentionViolationSchema>

export const attentionWorkSchema = z.object({
  assignmentId: idSchema,
  title: z.string(),
  cohortId: idSchema,
  cohortName: z.string(),
  dueAt: isoDateTimeSchema,
  /** Closing soon: who has not submitted yet. Missed: who missed it. */
  people: z.array(person.extend({ dueAt: isoDateTimeSchema.nullable(), inProgress: z.boolean() })),
})
export type AttentionWork = z.infer<typeof attentionWorkSchema>

export const attentionSchema = z.object({
  awaitingReview: z.object({ items: z.array(attentionAttemptSchema), total: z.number().int().nonnegative() }),
  safetyViolations: z.array(attentionViolationSchema),
  closingSoon: z.array(attentionWorkSchema),
  missed: z.array(attentionWorkSchema),
  generatedAt: isoDateTimeSchema,
})
export type Attention = z.infer<typeof attentionSchema>
