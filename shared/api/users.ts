// Admin management of accounts.
import { z } from 'zod'
import { pageOf, pageQuerySchema } from './common'
import { roleSchema, userSchema } from './auth'

export const userListQuerySchema = pageQuerySchema.extend({
  role: roleSchema.optional(),
  q: z.string().trim().max(120).optional(),
  active: z
    .enum(['true', 'false'])
    .transform((value) => value === 'true')
    .optional(),
})
export type UserListQuery = z.input<typeof userListQuerySchema>

/**
 * A person who came in from a learning platform without a shared e-mail address holds a reserved one
 * (RFC 2606 `.invalid`, never mailed) because accounts need a unique address; screens show none instead.
 */
export const PLACEHOLDER_EMAIL_DOMAIN = '@platform.invalid'
export const shownEmail = (email: string) => (email.endsWith(PLACEHOLDER_EMAIL_DOMAIN) ? '' : email)

export const userPageSchema = pageOf(userSchema)
export type UserPage = z.infer<typeof userPageSchema>

export const updateUserRequestSchema = z
  .object({ role: roleSchema.optional(), active: z.boolean().optional() })
  .refine((value) => value.role !== undefined || value.active !== undefined, {
    error: 'Give a role or an active flag to change',
  })
export type UpdateUserRequest = z.infer<typeof updateUserRequestSchema>
