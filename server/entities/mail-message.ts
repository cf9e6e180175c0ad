// A message received by the embedded SMTP server (the local outbox), once per Message-ID.
import { EntitySchema } from 'typeorm'
import { text, timestamp, uuidPrimary, varchar } from './columns'

export interface MailMessageRow {
  id: string
  /** The message's Message-ID header: a retried delivery of the same mail job carries the same one. */
  messageId: string | null
  fromAddress: string
  toAddress: string
  subject: string
  text: string
  html: string
  receivedAt: string
}

export const MailMessageEntity = new EntitySchema<MailMessageRow>({
  name: 'MailMessage',
  tableName: 'mail_messages',
  columns: {
    id: uuidPrimary,
    messageId: varchar(255, true),
    fromAddress: varchar(320),
    toAddress: text,
    subject: text,
    text,
    html: text,
    receivedAt: timestamp,
  },
  indices: [{ name: 'uq_mail_messages_message_id', columns: ['messageId'], unique: true }],
})
