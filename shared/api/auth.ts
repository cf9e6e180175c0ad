// Sign-in, session refresh, password reset and the signed-in user's own record.
import { z } from 'zod'
import { emailSchema, idSchema, isoDateTimeSchema, personNameSchema } from './common'

export const roles = ['apprentice', 'instructor', 'admin'] as const
export const roleSchema = z.enum(roles)
export type Role = z.infer<typeof roleSchema>

export const PASSWORD_MIN_LENGTH = 12
export const PASSWORD_MAX_LENGTH = 128
/** Length is what matters (OWASP ASVS 5.0: long passwords allowed, no composition rules). */
export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, {
    error: `Use at least ${PASSWORD_MIN_LENGTH} characters — a short phrase of a few words works well`,
  })
  .max(PASSWORD_MAX_LENGTH, { error: `Use at most ${PASSWORD_MAX_LENGTH} characters` })
  .refine((value) => value.trim().length >= PASSWORD_MIN_LENGTH, {
    error: 'A password cannot be mostly spaces',
  })

export const userSchema = z.object({
  id: idSchema,
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  active: z.boolean(),
  createdAt: isoDateTimeSchema,
  lastSignInAt: isoDateTimeSchema.nullable(),
})
export type User = z.infer<typeof userSchema>

export const signInRequestSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, { error: 'Enter your password' }).max(PASSWORD_MAX_LENGTH),
})
export type SignInRequest = z.infer<typeof signInRequestSchema>

/** The refresh token travels only in an httpOnly cookie; the body carries the access token. */
export const sessionResponseSchema = z.object({
  accessToken: z.string(),
  expiresAt: isoDateTimeSchema,
  user: userSchema,
})
export type SessionResponse = z.infer<typeof sessionResponseSchema>

export const meResponseSchema = z.object({ user: userSchema })
export type MeResponse = z.infer<typeof meResponseSchema>

export const passwordResetRequestSchema = z.object({ email: emailSchema })
export type PasswordResetRequest = z.infer<typeof passwordResetRequestSchema>

export const passwordResetConfirmSchema = z.object({
  token: z.string().min(16).max(200),
  password: passwordSchema,
})
export type PasswordResetConfirm = z.infer<typeof passwordResetConfirmSchema>

export const changePasswordRequestSchema = z.object({
  currentPassword: z.string().min(1, { error: 'Enter your current password' }).max(PASSWORD_MAX_LENGTH),
  newPassword: passwordSchema,
})
export type ChangePasswordRequest = z.infer<typeof changePasswordRequestSchema>

export const updateProfileRequestSchema = z.object({ name: personNameSchema })
export type UpdateProfileRequest = z.infer<typeof updateProfileRequestSchema>

/** Names of the cookie and the access-token lifetime, so client and tests agree. */
export const REFRESH_COOKIE_NAME = 'slipway_refresh'
export const ACCESS_TOKEN_TTL_SECONDS = 15 * 60
