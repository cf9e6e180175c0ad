// A message received by the embedded SMTP server (the local outbox).
import { EntitySchema } from 'typeorm'
import { text, timestamp, uuidPrimary, varchar } from './columns'

export interface MailMessageRow {
  id: string
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
    fromAddress: varchar(320),
    toAddress: text,
    subject: text,
    text,
    html: text,
    receivedAt: timestamp,
  },
})
