// How a message's place in the outbox reads to an admin: a short status, its colour, and one sentence.
import type { OutboxMessage, OutboxStatus } from '@shared/api'
import { formatDateTime } from '@/composables/format'

export const STATUS_LABELS: Record<OutboxStatus, string> = {
  queued: 'Waiting',
  sending: 'Sending',
  sent: 'Sent',
  failed: 'Not sent',
}

export const STATUS_COLOURS: Record<OutboxStatus, string> = {
  queued: 'info',
  sending: 'primary',
  sent: 'success',
  failed: 'error',
}

/** What an empty list under a status filter means. */
export const EMPTY_TEXTS: Record<OutboxStatus | 'all', string> = {
  all: 'Invitations, password resets and grade notices appear here once queued.',
  queued: 'No message is waiting to be sent.',
  sending: 'No message is being handed to the mail relay right now.',
  sent: 'No message has been sent in the last 90 days.',
  failed: 'Every message went out: none is marked “Not sent”.',
}

const attemptsText = (n: number) => (n === 1 ? '1 attempt' : `${n} attempts`)

/** One sentence on where the message stands and, when something went wrong, why. */
export function statusSentence(m: OutboxMessage): string {
  const reason = m.lastError ? ` ${m.lastError.replace(/\.?$/, '.')}` : ''
  switch (m.status) {
    case 'queued':
      return m.attempts === 0
        ? `Queued ${formatDateTime(m.createdAt)}; sending shortly.`
        : `Attempt ${m.attempts} of ${m.maxAttempts} did not go through.${reason} Next try ${formatDateTime(m.nextAttemptAt)}.`
    case 'sending':
      return `Being handed to the mail relay (attempt ${m.attempts} of ${m.maxAttempts}).`
    case 'sent':
      return `Sent ${formatDateTime(m.finishedAt)}${m.attempts > 1 ? ` after ${attemptsText(m.attempts)}` : ''}.`
    case 'failed':
      return `Given up ${formatDateTime(m.finishedAt)} after ${attemptsText(m.attempts)}.${reason}`
  }
}
