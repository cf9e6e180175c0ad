// Mail goes through the durable job queue: `queueMail(manager, mail)` inside the transaction of the change
// that causes it (no mail for a rolled-back change, no change without its mail); a worker delivers it.
import type { EntityManager } from 'typeorm'
import { z } from 'zod'
import { defineJobKind, type EnqueuedJob } from '../jobs'

export const outgoingMailSchema = z.object({
  to: z.string().min(1).max(1000),
  subject: z.string().max(998),
  text: z.string(),
  html: z.string(),
})
export type OutgoingMail = z.infer<typeof outgoingMailSchema>

export const mailJob = defineJobKind({
  kind: 'mail',
  payload: outgoingMailSchema,
  // 15 s, 30 s, 1 min … then hourly: about four hours of a relay being down before a message is given up.
  retry: { maxAttempts: 12, firstDelayMs: 15_000, maxDelayMs: 3_600_000 },
  timeoutMs: 2 * 60_000,
  label: (mail) => mail.to,
})

/**
 * Queues one message. The reserved .invalid top-level domain (RFC 2606) can never receive mail: accounts that
 * came in from a learning platform without a shared address hold one, so nothing is queued for them.
 */
export const queueMail = async (manager: EntityManager, mail: OutgoingMail): Promise<EnqueuedJob | null> =>
  /\.invalid$/i.test(mail.to) ? null : mailJob.enqueue(manager, mail)

/** What a sent message keeps in the queue once a real relay has it: who and what, not the body. */
export const withoutBody = (mail: OutgoingMail): OutgoingMail => ({ ...mail, text: '', html: '' })
