// Which optional mail a person receives, set on their profile. Mail they cannot do without (invitations,
// password resets, grades and feedback) is not optional.
import { z } from 'zod'

export const mailPreferencesSchema = z.object({
  /** Apprentices: a reminder before a due date while their work has not passed (48 and 24 hours before). */
  dueReminders: z.boolean(),
  /** Instructors: a morning summary of new submissions and safety violations in the cohorts they teach. */
  dailyDigest: z.boolean(),
})
export type MailPreferences = z.infer<typeof mailPreferencesSchema>

export const updateMailPreferencesRequestSchema = mailPreferencesSchema.partial().strict()
export type UpdateMailPreferencesRequest = z.infer<typeof updateMailPreferencesRequestSchema>

/** Hours before a due date at which a reminder is sent (each at most once per due date). */
export const DUE_REMINDER_HOURS = [48, 24] as const
