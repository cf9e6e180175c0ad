// A message the embedded outbox received → the admin outbox's MailMessage.
import type { MailMessage } from '@shared/api/admin'
import type { MailMessageRow } from '../entities'

export const presentMail = (row: MailMessageRow): MailMessage => ({
  id: row.id,
  from: row.fromAddress,
  to: row.toAddress,
  subject: row.subject,
  text: row.text,
  html: row.html,
  receivedAt: row.receivedAt,
})
