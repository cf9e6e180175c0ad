// Assignments: one scenario version set for a cohort with a window, an attempt limit and a hint rule.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema } from './common'

/** Which score counts when an assignment sends grades to a learning platform: the best, or the latest. */
export const scorePolicySchema = z.enum(['best', 'latest'])
export type ScorePolicy = z.infer<typeof scorePolicySchema>

const assignmentFields = {
  title: z.string().trim().max(160).optional(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  attemptLimit: z.number().int().min(1).max(100).nullable(),
  hintsAllowed: z.boolean(),
  scorePolicy: scorePolicySchema.default('best'),
}

export const createAssignmentRequestSchema = z
  .object({ scenarioId: idSchema, ...assignmentFields })
  .refine((value) => Date.parse(value.dueAt) > Date.parse(value.opensAt), {
    error: 'The due date must be after the opening date',
    path: ['dueAt'],
  })
export type CreateAssignmentRequest = z.infer<typeof createAssignmentRequestSchema>

export const updateAssignmentRequestSchema = z
  .object({
    title: assignmentFields.title,
    opensAt: assignmentFields.opensAt.optional(),
    dueAt: assignmentFields.dueAt.optional(),
    attemptLimit: assignmentFields.attemptLimit.optional(),
    hintsAllowed: assignmentFields.hintsAllowed.optional(),
    scorePolicy: scorePolicySchema.optional(),
  })
  .refine((value) => Object.values(value).some((field) => field !== undefined), {
    error: 'Give at least one field to change',
  })
export type UpdateAssignmentRequest = z.infer<typeof updateAssignmentRequestSchema>

/** The apprentice's own standing on it (only in apprentice views). */
export const myProgressSchema = z.object({
  attemptsUsed: z.number().int().nonnegative(),
  bestScore: z.number().nullable(),
  passed: z.boolean(),
  inProgressAttemptId: idSchema.nullable(),
})
export type MyProgress = z.infer<typeof myProgressSchema>

export const assignmentSchema = z.object({
  id: idSchema,
  cohortId: idSchema,
  cohortName: z.string(),
  scenarioId: idSchema,
  scenarioKey: z.string(),
  scenarioVersion: z.number().int(),
  title: z.string(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  attemptLimit: z.number().int().nullable(),
  hintsAllowed: z.boolean(),
  scorePolicy: scorePolicySchema,
  createdAt: isoDateTimeSchema,
  myProgress: myProgressSchema.nullable(),
})
export type Assignment = z.infer<typeof assignmentSchema>

export const assignmentListQuerySchema = z.object({ cohortId: idSchema.optional() })
export type AssignmentListQuery = z.infer<typeof assignmentListQuerySchema>
export const assignmentListSchema = z.object({ items: z.array(assignmentSchema) })
export type AssignmentList = z.infer<typeof assignmentListSchema>

export const assignmentStatsSchema = z.object({
  assignmentId: idSchema,
  apprentices: z.number().int().nonnegative(), // enrolled in the cohort
  attempted: z.number().int().nonnegative(), // with at least one graded attempt
  mean: z.number().nullable(), // of each apprentice's best score
  median: z.number().nullable(),
  passRate: z.number().min(0).max(1).nullable(), // passed / attempted
  histogram: z.array(z.object({ from: z.number(), to: z.number(), count: z.number().int().nonnegative() })),
})
export type AssignmentStats = z.infer<typeof assignmentStatsSchema>
