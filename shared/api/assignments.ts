// Assignments: one scenario version set for a cohort with a window, an attempt limit and an assistance level.
import { z } from 'zod'
import { LATE_POLICIES, WORK_STATUSES } from '../progress/standing'
import { assistanceLevelSchema, levelFromHintsAllowed, type AssistanceLevel } from '../scenario/assistance'
import { idSchema, isoDateTimeSchema } from './common'

/** Which score counts when an assignment sends grades to a learning platform: the best, or the latest. */
export const scorePolicySchema = z.enum(['best', 'latest'])
export type ScorePolicy = z.infer<typeof scorePolicySchema>
export const latePolicyFieldSchema = z.enum(LATE_POLICIES)

/** An assessment allows no hints; any other level allows them. */
function levelAgreesWithHints(value: { assistanceLevel?: AssistanceLevel; hintsAllowed?: boolean }): boolean {
  if (value.assistanceLevel === undefined || value.hintsAllowed === undefined) return true
  return (value.assistanceLevel === 'assessment') === !value.hintsAllowed
}
const HINTS_DISAGREE = {
  error:
    'Hints are allowed at every assistance level except assessment: leave hintsAllowed out or make it agree',
  path: ['hintsAllowed'],
}

/** The level a create or update request asks for (undefined: it asks for no change). */
export function requestedAssistanceLevel(value: {
  assistanceLevel?: AssistanceLevel
  hintsAllowed?: boolean
}): AssistanceLevel | undefined {
  if (value.assistanceLevel) return value.assistanceLevel
  return value.hintsAllowed === undefined ? undefined : levelFromHintsAllowed(value.hintsAllowed)
}

const assignmentFields = {
  title: z.string().trim().max(160).optional(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  attemptLimit: z.number().int().min(1).max(100).nullable(),
  /** How much help an attempt gets (shared/scenario/assistance.ts); absent: from `hintsAllowed`, else standard. */
  assistanceLevel: assistanceLevelSchema.optional(),
  /** Kept for older clients: false means an assessment. The level wins when both are given (they must agree). */
  hintsAllowed: z.boolean().optional(),
  scorePolicy: scorePolicySchema.default('best'),
  /** Close at the due date, or accept late work with a penalty (points off a late attempt's score). */
  latePolicy: latePolicyFieldSchema.default('acceptLate'),
  latePenalty: z.number().int().min(0).max(100).default(0),
}

export const createAssignmentRequestSchema = z
  .object({
    scenarioId: idSchema,
    ...assignmentFields,
    /** Set for these members only (absent or null: the whole cohort). */
    apprenticeIds: z
      .array(idSchema)
      .min(1, { error: 'Choose at least one apprentice' })
      .max(2000)
      .nullable()
      .optional(),
  })
  .refine((value) => Date.parse(value.dueAt) > Date.parse(value.opensAt), {
    error: 'The due date must be after the opening date',
    path: ['dueAt'],
  })
  .refine(levelAgreesWithHints, HINTS_DISAGREE)
export type CreateAssignmentRequest = z.input<typeof createAssignmentRequestSchema>
export type CreateAssignment = z.output<typeof createAssignmentRequestSchema>

export const updateAssignmentRequestSchema = z
  .object({
    title: assignmentFields.title,
    opensAt: assignmentFields.opensAt.optional(),
    dueAt: assignmentFields.dueAt.optional(),
    attemptLimit: assignmentFields.attemptLimit.optional(),
    assistanceLevel: assignmentFields.assistanceLevel,
    hintsAllowed: assignmentFields.hintsAllowed,
    scorePolicy: scorePolicySchema.optional(),
    latePolicy: latePolicyFieldSchema.optional(),
    latePenalty: z.number().int().min(0).max(100).optional(),
    /** Who it is set for: members by id, or null for the whole cohort. */
    apprenticeIds: z
      .array(idSchema)
      .min(1, { error: 'Choose at least one apprentice' })
      .max(2000)
      .nullable()
      .optional(),
  })
  .refine((value) => Object.values(value).some((field) => field !== undefined), {
    error: 'Give at least one field to change',
  })
  .refine(levelAgreesWithHints, HINTS_DISAGREE)
export type UpdateAssignmentRequest = z.infer<typeof updateAssignmentRequestSchema>

/** The apprentice's own standing on it (only in apprentice views), under their own terms. */
export const myProgressSchema = z.object({
  attemptsUsed: z.number().int().nonnegative(),
  /** The score that counts (late penalty applied). */
  bestScore: z.number().nullable(),
  passed: z.boolean(),
  inProgressAttemptId: idSchema.nullable(),
  status: z.enum(WORK_STATUSES),
  /** Their own due date (an extension, or none when it passed before they enrolled). */
  dueAt: isoDateTimeSchema.nullable(),
  /** Their own attempt allowance (the assignment's plus any extra attempts). */
  attemptLimit: z.number().int().nullable(),
  excused: z.boolean(),
  extended: z.boolean(),
})
export type MyProgress = z.infer<typeof myProgressSchema>

export const assignmentSchema = z.object({
  id: idSchema,
  cohortId: idSchema,
  cohortName: z.string(),
  scenarioId: idSchema,
  scenarioKey: z.string(),
  /** The scenario's own title, for people (the key is for links). */
  scenarioTitle: z.string(),
  scenarioVersion: z.number().int(),
  title: z.string(),
  opensAt: isoDateTimeSchema,
  dueAt: isoDateTimeSchema,
  attemptLimit: z.number().int().nullable(),
  assistanceLevel: assistanceLevelSchema,
  /** False exactly when the level is assessment. */
  hintsAllowed: z.boolean(),
  scorePolicy: scorePolicySchema,
  latePolicy: latePolicyFieldSchema,
  latePenalty: z.number().int(),
  /** Set for selected apprentices only (the assignment page lists who). */
  targeted: z.boolean(),
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
  /** Best scores per bin, passes and the rest apart (count = passed + not passed). */
  histogram: z.array(
    z.object({
      from: z.number(),
      to: z.number(),
      count: z.number().int().nonnegative(),
      passed: z.number().int().nonnegative(),
    }),
  ),
  /** The pass mark as a score out of 100, and how many objectives must be met whatever the score. */
  passMark: z.number().nullable(),
  requiredObjectives: z.number().int().nonnegative(),
})
export type AssignmentStats = z.infer<typeof assignmentStatsSchema>

/** An apprentice on one assignment: their own terms and where they stand (the assignment page). */
export const assignmentApprenticeSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  /** False when the assignment is set for selected apprentices and not for this one. */
  assigned: z.boolean(),
  status: z.enum(WORK_STATUSES),
  score: z.number().nullable(),
  attempts: z.number().int().nonnegative(),
  /** Their own due date; null when it passed before they enrolled. */
  dueAt: isoDateTimeSchema.nullable(),
  extended: z.boolean(),
  attemptLimit: z.number().int().nullable(),
  extraAttempts: z.number().int().nonnegative(),
  excused: z.boolean(),
  /** Why the instructor made an exception (empty when none). */
  reason: z.string(),
})
export type AssignmentApprentice = z.infer<typeof assignmentApprenticeSchema>
export const assignmentApprenticeListSchema = z.object({ items: z.array(assignmentApprenticeSchema) })

/**
 * One exception for each apprentice named: their own due date (null: the assignment's), extra attempts,
 * excused. Fields left out keep what each already has.
 */
export const exceptionRequestSchema = z
  .object({
    userIds: z.array(idSchema).min(1, { error: 'Choose at least one apprentice' }).max(2000),
    dueAt: isoDateTimeSchema.nullable().optional(),
    extraAttempts: z.number().int().min(0).max(50).optional(),
    excused: z.boolean().optional(),
    /** Kept with the exception and shown beside it. */
    reason: z.string().trim().min(1, { error: 'Say why (it is kept with the exception)' }).max(500),
  })
  .refine((v) => v.dueAt !== undefined || v.extraAttempts !== undefined || v.excused !== undefined, {
    error: 'Give a due date, extra attempts or an excusal',
  })
export type ExceptionRequest = z.infer<typeof exceptionRequestSchema>

export const assignmentMemberParamsSchema = z.object({ id: idSchema, userId: idSchema })
