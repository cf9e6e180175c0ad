// A mail job → the admin outbox's OutboxMessage: its status in the outbox's terms, and the message itself
// only in the local set-up.
import type { OutboxMessage, OutboxStatus } from '@shared/api/admin'
import type { JobRow } from '../entities'
import type { OutgoingMail } from '../infrastructure/mail/mail-job'

/** A job leased to an instance whose lease has run out is waiting to be taken over: queued again. */
export function outboxStatus(row: Pick<JobRow, 'status' | 'lockedUntil'>, now: string): OutboxStatus {
  if (row.status === 'done') return 'sent'
  if (row.status === 'failed') return 'failed'
  if (row.status === 'running' && row.lockedUntil !== null && row.lockedUntil > now) return 'sending'
  return 'queued'
}

export function presentOutboxMessage(
  row: JobRow,
  mail: OutgoingMail,
  { from, local, now }: { from: string; local: boolean; now: string },
): OutboxMessage {
  const status = outboxStatus(row, now)
  return {
    id: row.id,
    from,
    to: mail.to,
    subject: mail.subject,
    status,
    attempts: row.attempts,
    maxAttempts: row.maxAttempts,
    lastError: status === 'sent' ? null : row.lastError,
    createdAt: row.createdAt,
    nextAttemptAt: status === 'queued' ? (row.runAt > now ? row.runAt : now) : null,
    finishedAt: row.finishedAt,
    body: local ? { text: mail.text, html: mail.html } : null,
  }
}
