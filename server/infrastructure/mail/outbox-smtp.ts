// The embedded SMTP relay on loopback: receives each message over SMTP, parses it and stores it in the outbox.
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
          dataSource.getRepository(MailMessageEntity).insert({
            id: randomUUID(),
            fromAddress: addressText(parsed.from),
            toAddress: addressText(parsed.to),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            receivedAt: nowIso(),
          }),
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
