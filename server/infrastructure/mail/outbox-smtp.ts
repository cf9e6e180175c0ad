// The embedded SMTP relay on loopback: receives each message over SMTP, parses it and stores it in the outbox,
// once per Message-ID: a delivery repeated after a crash (stored here, not yet marked sent) is accepted again
// and stored no second time.
import type { AddressInfo } from 'node:net'
import { randomUUID } from 'node:crypto'
import { simpleParser, type AddressObject } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import type { DataSource } from 'typeorm'
import type { Logger } from '../logging'
import { MailMessageEntity } from '../../entities'
import { nowIso } from '../clock'

export interface OutboxSmtp {
  host: string
  port: number
  close(): Promise<void>
}

const addressText = (value: AddressObject | AddressObject[] | undefined) =>
  (Array.isArray(value) ? value : value ? [value] : []).map((entry) => entry.text).join(', ')

export async function startOutboxSmtp(dataSource: DataSource, log: Logger, port = 0): Promise<OutboxSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['AUTH', 'STARTTLS'],
    size: 5 * 1024 * 1024,
    logger: false,
    banner: 'Slipway local outbox',
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((parsed) =>
          dataSource
            .createQueryBuilder()
            .insert()
            .into(MailMessageEntity)
            .values({
              id: randomUUID(),
              messageId: parsed.messageId?.slice(0, 255) ?? null,
              fromAddress: addressText(parsed.from),
              toAddress: addressText(parsed.to),
              subject: parsed.subject ?? '',
              text: parsed.text ?? '',
              html: typeof parsed.html === 'string' ? parsed.html : '',
              receivedAt: nowIso(),
            })
            .orIgnore()
            .execute(),
        )
        .then(() => callback())
        .catch((err: Error) => {
          log.error({ err }, 'outbox could not store a message')
          callback(err)
        })
    },
  })
  server.on('error', (err) => log.error({ err }, 'outbox SMTP error'))
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve())
  })
  const address = server.server.address() as AddressInfo
  return {
    host: '127.0.0.1',
    port: address.port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}

/** Deletes messages the embedded relay received before `before` (the outbox keeps them as long as the queue). */
export async function pruneOutbox(dataSource: DataSource, before: Date): Promise<number> {
  const result = await dataSource
    .createQueryBuilder()
    .delete()
    .from(MailMessageEntity)
    .where('"receivedAt" < :before', { before: before.toISOString() })
    .execute()
  return result.affected ?? 0
}
