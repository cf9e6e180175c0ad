// The training centre's settings: its name and the time zone every date is shown in.
import { z } from 'zod'
import { isTimeZone } from '../time/zone'
import { isoDateTimeSchema } from './common'

export const timeZoneSchema = z
  .string()
  .trim()
  .refine(isTimeZone, { error: 'Choose a time zone from the list (an IANA name such as Europe/London)' })

export const centreSettingsSchema = z.object({
  name: z.string(),
  timeZone: z.string(),
  updatedAt: isoDateTimeSchema.nullable(),
})
export type CentreSettings = z.infer<typeof centreSettingsSchema>

export const updateCentreSettingsRequestSchema = z
  .object({
    name: z.string().trim().min(1, { error: 'Enter the centre’s name' }).max(120).optional(),
    timeZone: timeZoneSchema.optional(),
  })
  .refine((value) => value.name !== undefined || value.timeZone !== undefined, {
    error: 'Give a name or a time zone to change',
  })
export type UpdateCentreSettingsRequest = z.infer<typeof updateCentreSettingsRequestSchema>
