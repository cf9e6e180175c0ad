// Admin-only views: the local mail outbox and health.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema, pageOf, pageQuerySchema } from './common'

export const mailMessageSchema = z.object({
  id: idSchema,
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  text: z.string(),
  html: z.string(),
  receivedAt: isoDateTimeSchema,
})
export type MailMessage = z.infer<typeof mailMessageSchema>

export const outboxQuerySchema = pageQuerySchema.extend({ to: z.string().trim().max(254).optional() })
export type OutboxQuery = z.input<typeof outboxQuerySchema>
export const outboxPageSchema = pageOf(mailMessageSchema)
export type OutboxPage = z.infer<typeof outboxPageSchema>

export const healthResponseSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  version: z.string(),
  database: z.object({ ok: z.boolean(), driver: z.string() }),
})
export type HealthResponse = z.infer<typeof healthResponseSchema>
