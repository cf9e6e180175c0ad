// Sends mail through nodemailer over SMTP, in the background: a failure is retried and never fails the request.
import nodemailer, { type Transporter } from 'nodemailer'
import type { Logger } from '../logging'

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  html: string
}

export interface SmtpTarget {
  host: string
  port: number
  user?: string
  pass?: string
  secure: boolean
  /** The embedded loopback relay offers no TLS; a real relay should. */
  requireTls?: boolean
}

export interface Mailer {
  /** Queues the message and returns at once. */
  send(mail: OutgoingMail): void
  /** Resolves when every queued message has been delivered or given up (tests, shutdown). */
  idle(): Promise<void>
  /** Messages waiting or being sent, and those given up since start (metrics). */
  stats(): { queued: number; failed: number }
  close(): void
}

export interface MailerOptions {
  target: SmtpTarget
  from: string
  log: Logger
  /** Delays before each retry; the default gives up after about a minute. */
  retryDelaysMs?: number[]
}

export function createMailer({
  target,
  from,
  log,
  retryDelaysMs = [1000, 5000, 20_000, 40_000],
}: MailerOptions): Mailer {
  const loopback = target.host === '127.0.0.1' || target.host === 'localhost'
  const transport: Transporter = nodemailer.createTransport({
    host: target.host,
    port: target.port,
    secure: target.secure,
    ignoreTLS: loopback && !target.requireTls,
    auth: target.user ? { user: target.user, pass: target.pass ?? '' } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  const pending = new Set<Promise<void>>()
  const timers = new Set<NodeJS.Timeout>()
  let closed = false
  let failed = 0

  const wait = (ms: number) =>
    new Promise<void>((resolve) => {
      const timer = setTimeout(() => {
        timers.delete(timer)
        resolve()
      }, ms)
      timers.add(timer)
    })

  async function deliver(mail: OutgoingMail) {
    for (let attempt = 0; ; attempt++) {
      try {
        await transport.sendMail({ from, ...mail })
        return
      } catch (err) {
        if (closed || attempt >= retryDelaysMs.length) {
          log.error({ err, to: mail.to, subject: mail.subject }, 'mail could not be sent; giving up')
          failed++
          return
        }
        log.warn({ err, to: mail.to, attempt: attempt + 1 }, 'mail not sent; retrying')
        await wait(retryDelaysMs[attempt]!)
      }
    }
  }

  return {
    send(mail) {
      const job = deliver(mail).finally(() => pending.delete(job))
      pending.add(job)
    },
    async idle() {
      while (pending.size) await Promise.all([...pending])
    },
    stats: () => ({ queued: pending.size, failed }),
    close() {
      closed = true
      for (const timer of timers) clearTimeout(timer)
      transport.close()
    },
  }
}
