// The admin outbox over the job queue: a message is queued with the change that causes it, then sent; a
// relay that is down leaves it queued with the reason in words, then failed; an admin sends it again; a
// delivery repeated after a crash reaches the embedded relay once (same Message-ID).
import { createServer } from 'node:net'
import { pino } from 'pino'
import supertest from 'supertest'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import { outboxPageSchema, outboxRetryResponseSchema, type OutboxPage } from '../../shared/api'
import { JobEntity, MailMessageEntity } from '../../server/entities'
import { createJobWorker, type JobWorker } from '../../server/infrastructure/jobs'
import { claimJobs } from '../../server/infrastructure/jobs/job-store'
import { mailJob, withoutBody } from '../../server/infrastructure/mail/mail-job'
import { createMailDelivery, messageIdFor } from '../../server/infrastructure/mail/mailer'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort } from '../support/world'

const log = pino({ level: 'silent' })

async function unusedPort(): Promise<number> {
  const probe = createServer()
  const port: number = await new Promise((resolve) =>
    probe.listen(0, '127.0.0.1', () => resolve((probe.address() as { port: number }).port)),
  )
  await new Promise((resolve) => probe.close(resolve))
  return port
}

describe('mail outbox', () => {
  let api: TestApi
  let admin: TestUser
  const workers: JobWorker[] = []
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    admin = await api.createUser('admin')
  })
  afterEach(async () => {
    await Promise.all(workers.splice(0).map((w) => w.stop(100)))
  })
  afterAll(() => api.close())

  const outbox = async (query = ''): Promise<OutboxPage> => {
    const response = await supertest(api.app).get(`/api/admin/outbox${query}`).set(bearer(admin.token))
    expect(response.status).toBe(200)
    return outboxPageSchema.parse(response.body)
  }
  const received = (to: string) => api.dataSource.getRepository(MailMessageEntity).findBy({ toAddress: to })

  it('queues the mail in the request’s own transaction and sends it afterwards', async () => {
    const person = await api.createUser('instructor')
    await supertest(api.app).post('/api/auth/password-reset').send({ email: person.email })
    const before = await outbox(`?to=${encodeURIComponent(person.email)}`)
    expect(before.items.map((m) => m.status)).toEqual(['queued'])
    expect(before.items[0]!.nextAttemptAt).not.toBeNull()
    expect(await received(person.email)).toEqual([])
    await api.mail()
    const after = await outbox(`?to=${encodeURIComponent(person.email)}`)
    expect(after.items[0]).toMatchObject({ status: 'sent', attempts: 1, nextAttemptAt: null })
    expect(after.items[0]!.finishedAt).not.toBeNull()
    expect(await received(person.email)).toHaveLength(1)
  })

  it('queues no mail for a change that was rolled back', async () => {
    const instructor = await api.createUser('instructor')
    const cohort = await createCohort(api, instructor, 'Rollback cohort', [])
    const jobs = () => api.dataSource.getRepository(JobEntity).countBy({ kind: 'mail' })
    const before = await jobs()
    // The second row names an instructor's address: the whole roster is refused, after the first invitation.
    const csv = `email,name\nfresh.person@slipway.test,Fresh Person\n${instructor.email},Staff Member\n`
    const response = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations/roster`)
      .set(bearer(instructor.token))
      .attach('roster', Buffer.from(csv), { filename: 'roster.csv', contentType: 'text/csv' })
    expect(response.status).toBe(400)
    expect(await jobs()).toBe(before)
  })

  describe('with the relay down', () => {
    it('keeps the message queued with the reason in words, fails it after its last attempt, and sends it again on request', async () => {
      const to = 'unlucky.recipient@slipway.test'
      const { id } = await mailJob.enqueue(
        api.dataSource.manager,
        { to, subject: 'Relay test', text: 'Hello', html: '<p>Hello</p>' },
        { maxAttempts: 2 },
      )
      let now = Date.now()
      const broken = createMailDelivery({
        target: { host: '127.0.0.1', port: await unusedPort(), secure: false },
        from: api.config.mailFrom,
        messageIdDomain: 'slipway.test',
      })
      const worker = createJobWorker({
        dataSource: api.dataSource,
        log,
        pollMs: 0,
        clock: () => new Date(now),
      })
      workers.push(worker)
      worker.handle(mailJob, broken.deliver)

      await worker.runDue()
      let [message] = (await outbox(`?to=${to}`)).items
      expect(message).toMatchObject({
        status: 'queued',
        attempts: 1,
        maxAttempts: 2,
        lastError: 'The mail relay refused the connection (is it running, on this host and port?)',
      })
      // The mail kind waits 15 s (up to a fifth less) before its second attempt.
      const wait = Date.parse(message!.nextAttemptAt!) - now
      expect(wait).toBeGreaterThanOrEqual(12_000)
      expect(wait).toBeLessThanOrEqual(15_000)

      now += 15_000
      await worker.runDue()
      const failed = await outbox('?status=failed')
      ;[message] = failed.items.filter((m) => m.to === to)
      expect(message).toMatchObject({ status: 'failed', attempts: 2, nextAttemptAt: null })
      expect(message!.lastError).toMatch(/refused the connection/)
      expect(failed.counts.failed).toBeGreaterThanOrEqual(1)
      broken.close()

      const retried = await supertest(api.app).post(`/api/admin/outbox/${id}/retry`).set(bearer(admin.token))
      expect(retried.status).toBe(200)
      expect(outboxRetryResponseSchema.parse(retried.body).message).toMatchObject({
        status: 'queued',
        attempts: 0,
      })
      await api.mail() // the working relay
      expect((await outbox(`?to=${to}`)).items[0]).toMatchObject({ status: 'sent', lastError: null })
      expect(await received(to)).toHaveLength(1)

      const again = await supertest(api.app).post(`/api/admin/outbox/${id}/retry`).set(bearer(admin.token))
      expect(again.status).toBe(409)
      expect(again.body.error.message).toBe(
        'Only a message that failed can be sent again; this one has not failed',
      )
    })

    it('answers 404 for a message that does not exist', async () => {
      const response = await supertest(api.app)
        .post('/api/admin/outbox/00000000-0000-4000-8000-000000000000/retry')
        .set(bearer(admin.token))
      expect(response.status).toBe(404)
    })
  })

  it('stores a message once when its delivery is repeated after a crash between the relay’s acceptance and “sent”', async () => {
    const to = 'exactly.once@slipway.test'
    const { id } = await mailJob.enqueue(api.dataSource.manager, {
      to,
      subject: 'Once only',
      text: 'Hello',
      html: '<p>Hello</p>',
    })
    // An instance claims the job, hands the message to the relay, and dies before marking it sent.
    const [job] = await claimJobs(api.dataSource, {
      kinds: ['mail'],
      workerId: 'crashed',
      leaseMs: 1000,
      limit: 10,
      now: new Date(),
    })
    expect(job!.id).toBe(id)
    const domain = new URL(api.config.publicBaseUrl).hostname
    const delivery = createMailDelivery({
      target: { host: api.outbox.host, port: api.outbox.port, secure: false },
      from: api.config.mailFrom,
      messageIdDomain: domain,
    })
    await delivery.deliver(
      { to, subject: 'Once only', text: 'Hello', html: '<p>Hello</p>' },
      {
        id,
        kind: 'mail',
        attempt: 1,
        maxAttempts: 12,
        runAt: new Date(),
        dedupeKey: null,
        signal: new AbortController().signal,
      },
    )
    delivery.close()
    // After the lease, a live instance delivers it again, with the same Message-ID.
    const later = createJobWorker({
      dataSource: api.dataSource,
      log,
      pollMs: 0,
      clock: () => new Date(Date.now() + 2000),
    })
    workers.push(later)
    const again = createMailDelivery({
      target: { host: api.outbox.host, port: api.outbox.port, secure: false },
      from: api.config.mailFrom,
      messageIdDomain: domain,
    })
    later.handle(mailJob, again.deliver)
    expect(await later.runDue()).toBe(1)
    again.close()
    const stored = await received(to)
    expect(stored.map((m) => m.messageId)).toEqual([messageIdFor(id, domain)])
    expect(await api.dataSource.getRepository(JobEntity).findOneByOrFail({ id })).toMatchObject({
      status: 'done',
      attempts: 2,
    })
  })

  it('hands a real relay the job’s Message-ID, and keeps no body once a real relay has the message', async () => {
    const seen: { messageId?: string; to: string }[] = []
    const relay = new SMTPServer({
      authOptional: true,
      disabledCommands: ['AUTH', 'STARTTLS'],
      logger: false,
      onData(stream, _session, callback) {
        simpleParser(stream)
          .then((parsed) =>
            seen.push({
              messageId: parsed.messageId,
              to: parsed.to ? String((parsed.to as { text: string }).text) : '',
            }),
          )
          .then(() => callback(), callback)
      },
    })
    await new Promise<void>((resolve) => relay.listen(0, '127.0.0.1', resolve))
    const port = (relay.server.address() as { port: number }).port
    const delivery = createMailDelivery({
      target: { host: '127.0.0.1', port, secure: false },
      from: api.config.mailFrom,
      messageIdDomain: 'centre.example',
    })
    const worker = createJobWorker({ dataSource: api.dataSource, log, pollMs: 0 })
    workers.push(worker)
    worker.handle(mailJob, delivery.deliver, { whenDone: withoutBody })
    const { id } = await mailJob.enqueue(api.dataSource.manager, {
      to: 'far.away@slipway.test',
      subject: 'Your reset link',
      text: 'https://slipway.test/reset-password?token=secret',
      html: '<a href="https://slipway.test/reset-password?token=secret">Reset</a>',
    })
    await worker.runDue()
    delivery.close()
    await new Promise<void>((resolve) => relay.close(() => resolve()))
    expect(seen).toEqual([{ messageId: `<${id}@centre.example>`, to: 'far.away@slipway.test' }])
    const row = await api.dataSource.getRepository(JobEntity).findOneByOrFail({ id })
    expect(JSON.parse(row.payload)).toEqual({
      to: 'far.away@slipway.test',
      subject: 'Your reset link',
      text: '',
      html: '',
    })
  })
})
