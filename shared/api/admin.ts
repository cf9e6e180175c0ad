// Admin-only views: the mail outbox (every message Slipway queued, with where it stands) and health.
import { z } from 'zod'
import { idSchema, isoDateTimeSchema, pageOf, pageQuerySchema } from './common'

/**
 * Where a message is: waiting (for its first attempt or a retry), being handed to the mail relay, sent (the
 * relay accepted it), or failed (no attempts left, or refused for good; an admin may send it again).
 */
export const outboxStatuses = ['queued', 'sending', 'sent', 'failed'] as const
export const outboxStatusSchema = z.enum(outboxStatuses, { error: 'Must be queued, sending, sent or failed' })
export type OutboxStatus = z.infer<typeof outboxStatusSchema>

export const outboxMessageSchema = z.object({
  id: idSchema,
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  status: outboxStatusSchema,
  /** Attempts made so far, out of `maxAttempts`. */
  attempts: z.number().int().nonnegative(),
  maxAttempts: z.number().int().positive(),
  /** Why the last attempt failed, in words; null once sent. */
  lastError: z.string().nullable(),
  createdAt: isoDateTimeSchema,
  /** Queued: when the next attempt is due. */
  nextAttemptAt: isoDateTimeSchema.nullable(),
  /** Sent: when the relay accepted it; failed: when it was given up. */
  finishedAt: isoDateTimeSchema.nullable(),
  /**
   * The message itself, only in the local set-up (the embedded outbox, where no mail leaves the machine).
   * With a real relay it is not shown: it may hold a one-time link meant for the recipient alone.
   */
  body: z.object({ text: z.string(), html: z.string() }).nullable(),
})
export type OutboxMessage = z.infer<typeof outboxMessageSchema>

export const outboxQuerySchema = pageQuerySchema.extend({
  to: z.string().trim().max(254).optional(),
  status: outboxStatusSchema.optional(),
})
export type OutboxQuery = z.input<typeof outboxQuerySchema>
export const outboxPageSchema = pageOf(outboxMessageSchema).extend({
  /** Messages per status, whatever the filter (for the filter chips). */
  counts: z.object({ queued: z.number(), sending: z.number(), sent: z.number(), failed: z.number() }),
  /** True in the local set-up, where messages can be read here. */
  local: z.boolean(),
})
export type OutboxPage = z.infer<typeof outboxPageSchema>
export const outboxRetryResponseSchema = z.object({ message: outboxMessageSchema })

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
