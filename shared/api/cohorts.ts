// Cohorts (an instructor's group of apprentices) and their members.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema } from './common'

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
