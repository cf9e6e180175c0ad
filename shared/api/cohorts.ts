// Cohorts (an instructor's group of apprentices) and their members.
import { z } from 'zod'
import { emailSchema, idSchema, isoDateTimeSchema } from './common'

export const cohortSchema = z.object({
  id: idSchema,
  name: z.string(),
  description: z.string(),
  ownerId: idSchema,
  ownerName: z.string(),
  archived: z.boolean(),
  memberCount: z.number().int().nonnegative(),
  createdAt: isoDateTimeSchema,
})
export type Cohort = z.infer<typeof cohortSchema>

export const cohortListQuerySchema = z.object({
  includeArchived: z
    .enum(['true', 'false'])
    .transform((value) => value === 'true')
    .default(false),
})
export type CohortListQuery = z.input<typeof cohortListQuerySchema>
export const cohortListSchema = z.object({ items: z.array(cohortSchema) })
export type CohortList = z.infer<typeof cohortListSchema>

const cohortName = z.string().trim().min(1, { error: 'Enter a cohort name' }).max(120)
const cohortDescription = z.string().trim().max(2000)

/** Admins may create a cohort on behalf of an instructor with ownerId; instructors own what they create. */
export const createCohortRequestSchema = z.object({
  name: cohortName,
  description: cohortDescription.default(''),
  ownerId: idSchema.optional(),
})
export type CreateCohortRequest = z.input<typeof createCohortRequestSchema>

export const updateCohortRequestSchema = z
  .object({
    name: cohortName.optional(),
    description: cohortDescription.optional(),
    archived: z.boolean().optional(),
  })
  .refine((value) => Object.values(value).some((field) => field !== undefined), {
    error: 'Give at least one field to change',
  })
export type UpdateCohortRequest = z.infer<typeof updateCohortRequestSchema>

export const cohortMemberSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  active: z.boolean(),
  enrolledAt: isoDateTimeSchema,
})
export type CohortMember = z.infer<typeof cohortMemberSchema>
export const cohortMemberListSchema = z.object({ items: z.array(cohortMemberSchema) })
export type CohortMemberList = z.infer<typeof cohortMemberListSchema>

export const cohortMemberParamsSchema = z.object({ id: idSchema, userId: idSchema })

/** A message from the cohort's instructor to some of its members, by e-mail. */
export const cohortMessageRequestSchema = z.object({
  userIds: z.array(idSchema).min(1, { error: 'Choose at least one apprentice' }).max(2000),
  subject: z.string().trim().min(1, { error: 'Write a subject' }).max(160),
  body: z.string().trim().min(1, { error: 'Write a message' }).max(5000),
})
export type CohortMessageRequest = z.infer<typeof cohortMessageRequestSchema>
export const cohortMessageResultSchema = z.object({ sent: z.number().int().nonnegative() })

/** Removes several members at once (their accounts and past attempts stay). */
export const removeMembersRequestSchema = z.object({
  userIds: z.array(idSchema).min(1, { error: 'Choose at least one apprentice' }).max(2000),
})
export const removeMembersResultSchema = z.object({ removed: z.number().int().nonnegative() })

/** Who teaches a cohort: its owner, and co-instructors who manage it as the owner does. */
export const cohortInstructorSchema = z.object({
  userId: idSchema,
  name: z.string(),
  email: z.string(),
  /** The owner decides who else teaches the cohort; co-instructors do everything else. */
  owner: z.boolean(),
  /** When a co-instructor was added (the cohort's creation for its owner). */
  since: isoDateTimeSchema,
})
export type CohortInstructor = z.infer<typeof cohortInstructorSchema>
export const cohortInstructorListSchema = z.object({ items: z.array(cohortInstructorSchema) })

/** A co-instructor is added by the e-mail address of their Slipway instructor account. */
export const addCoInstructorRequestSchema = z.object({
  email: emailSchema,
})
export type AddCoInstructorRequest = z.infer<typeof addCoInstructorRequestSchema>
export const cohortInstructorParamsSchema = z.object({ id: idSchema, userId: idSchema })

/** The most a copy may move its dates (ten years either way). */
export const MAX_COPY_SHIFT_DAYS = 3660

/**
 * A cohort copied for its next intake: the same assignments (each one's dates moved by `shiftDays`) and
 * practice choices, no members. Assignments for chosen apprentices only are not copied (nobody is chosen yet).
 */
export const copyCohortRequestSchema = z.object({
  name: cohortName,
  description: cohortDescription.optional(),
  shiftDays: z
    .number({ error: 'Give the number of days to move the dates by' })
    .int({ error: 'Move the dates by whole days' })
    .min(-MAX_COPY_SHIFT_DAYS, { error: 'Dates can move at most ten years' })
    .max(MAX_COPY_SHIFT_DAYS, { error: 'Dates can move at most ten years' }),
  coInstructors: z.boolean().default(true),
})
export type CopyCohortRequest = z.input<typeof copyCohortRequestSchema>
export const copyCohortResultSchema = z.object({
  cohort: cohortSchema,
  assignmentsCopied: z.number().int().nonnegative(),
  /** Assignments set for chosen apprentices only, left out of the copy. */
  assignmentsLeftOut: z.number().int().nonnegative(),
})
export type CopyCohortResult = z.infer<typeof copyCohortResultSchema>
