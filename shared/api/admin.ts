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

/** GET /api/ready: whether this instance should be sent traffic (200) or not (503), and why. */
export const readyResponseSchema = z.object({
  ready: z.boolean(),
  checks: z.object({
    database: z.object({ ok: z.boolean() }),
    migrations: z.object({ ok: z.boolean() }),
    grading: z.object({ ok: z.boolean(), threads: z.number().int(), threadsUp: z.number().int() }),
    /** False once SIGTERM has been received: the instance is finishing its requests before it stops. */
    accepting: z.object({ ok: z.boolean() }),
  }),
})
export type ReadyResponse = z.infer<typeof readyResponseSchema>
