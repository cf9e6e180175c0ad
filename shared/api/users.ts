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

export const userPageSchema = pageOf(userSchema)
export type UserPage = z.infer<typeof userPageSchema>

export const updateUserRequestSchema = z
  .object({ role: roleSchema.optional(), active: z.boolean().optional() })
  .refine((value) => value.role !== undefined || value.active !== undefined, {
    error: 'Give a role or an active flag to change',
  })
export type UpdateUserRequest = z.infer<typeof updateUserRequestSchema>
