// Delivers one queued mail job over SMTP with nodemailer. The Message-ID is made from the job's id, so a
// delivery repeated after a crash (the relay accepted, the job was not yet marked sent) carries the same one:
// the embedded relay keeps each Message-ID once; a real relay may pass a repeat on (see DEVELOPERS.md).
import nodemailer, { type Transporter } from 'nodemailer'
import { JobError, type JobHandler } from '../jobs'
import type { OutgoingMail } from './mail-job'

export interface SmtpTarget {
  host: string
  port: number
  user?: string
  pass?: string
  secure: boolean
  /** The embedded loopback relay offers no TLS; a real relay should. */
  requireTls?: boolean
}

export interface MailDelivery {
  deliver: JobHandler<OutgoingMail>
  close(): void
}

export interface MailDeliveryOptions {
  target: SmtpTarget
  from: string
  /** The right-hand side of every Message-ID (the public host name). */
  messageIdDomain: string
}

export const messageIdFor = (jobId: string, domain: string) => `<${jobId}@${domain}>`

export function createMailDelivery({ target, from, messageIdDomain }: MailDeliveryOptions): MailDelivery {
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
  return {
    async deliver(mail, job) {
      try {
        await transport.sendMail({ from, ...mail, messageId: messageIdFor(job.id, messageIdDomain) })
      } catch (error) {
        throw inPlainWords(error)
      }
    },
    close: () => transport.close(),
  }
}

interface SmtpFailure {
  code?: string
  responseCode?: number
  response?: string
  message?: string
}

/** A nodemailer failure as a JobError an admin can act on; an SMTP 5xx answer is not worth retrying. */
export function inPlainWords(error: unknown): JobError {
  const { code, responseCode, response, message = '' } = (error ?? {}) as SmtpFailure
  const answer = response ? ` (it answered “${response.trim().slice(0, 300)}”)` : ''
  if (responseCode && responseCode >= 500)
    return new JobError(`The mail relay refused the message for good${answer}`, {
      permanent: true,
      cause: error,
    })
  if (responseCode && responseCode >= 400)
    return new JobError(`The mail relay asked to try again later${answer}`, { cause: error })
  if (code === 'EAUTH')
    return new JobError(`The mail relay did not accept the user name or password${answer}`, { cause: error })
  if (/ECONNREFUSED/.test(message))
    return new JobError('The mail relay refused the connection (is it running, on this host and port?)', {
      cause: error,
    })
  if (code === 'ETIMEDOUT' || /timeout|timed out/i.test(message))
    return new JobError('The mail relay did not answer in time', { cause: error })
  if (code === 'EDNS' || /ENOTFOUND|EAI_AGAIN/.test(message))
    return new JobError('The mail relay’s host name could not be found', { cause: error })
  if (code === 'ETLS')
    return new JobError('A secure connection to the mail relay could not be set up', { cause: error })
  if (code === 'EENVELOPE')
    return new JobError(`The recipient’s address was not accepted${answer}`, {
      permanent: true,
      cause: error,
    })
  return new JobError('The connection to the mail relay failed', { cause: error })
}
