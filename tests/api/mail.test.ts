// E-mail is queued with the change that causes it and goes over real SMTP to the embedded outbox.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MailMessageEntity } from '../../server/entities'
import { queueMail } from '../../server/infrastructure/mail/mail-job'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { createAssignment, createCohort } from '../support/world'

describe('mail', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi()
  })
  afterAll(() => api.close())

  it('tells each member of the cohort when an assignment is published, with a link and the due date', async () => {
    const instructor = await api.createUser('instructor')
    const first = await api.createUser('apprentice', { name: 'Marit Colquhoun' })
    const second = await api.createUser('apprentice', { name: 'Eben Stroud' })
    const cohort = await createCohort(api, instructor, 'Mail cohort', [first, second])
    const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(instructor.token))).body
      .items
    const scenario = scenarios.find((s: { key: string }) => s.key === 'safe-isolation')
    const assignment = await createAssignment(api, instructor, cohort, scenario.id, {
      title: 'Prove it dead',
      dueAt: '2031-03-04T15:30:00.000Z',
    })
    const mail = (await api.mail()).filter((m) => m.subject === 'New assignment: Prove it dead')
    expect(mail.map((m) => m.toAddress).sort()).toEqual([first.email, second.email].sort())
    const message = mail.find((m) => m.toAddress === first.email)!
    expect(message.text).toContain('Hello Marit Colquhoun')
    expect(message.text).toContain('due by 2031-03-04 15:30 UTC')
    expect(message.text).toContain(`http://slipway.test/assignments/${assignment.id}`)
    expect(message.text).toMatch(/lock out.*prove absence of voltage/s)
    expect(message.html).toContain(`href="http://slipway.test/assignments/${assignment.id}"`)
  })

  it('escapes names in the HTML body', async () => {
    const instructor = await api.createUser('instructor', { name: '<b>Bold</b> Instructor' })
    const cohort = await createCohort(api, instructor, 'Escaping cohort', [])
    await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: 'escape@slipway.test', name: 'Esc Ape' })
    const message = (await api.mail()).find((m) => m.toAddress === 'escape@slipway.test')!
    expect(message.html).toContain('&lt;b&gt;Bold&lt;/b&gt; Instructor')
    expect(message.html).not.toContain('<b>Bold</b>')
  })

  it('delivers through the SMTP protocol: the outbox row is parsed from a real message', async () => {
    const before = await api.dataSource.getRepository(MailMessageEntity).count()
    await queueMail(api.dataSource.manager, {
      to: 'Parsed Person <parsed@slipway.test>',
      subject: 'Ünïcode subject ✓',
      text: 'plain body',
      html: '<p>html body</p>',
    })
    const rows = await api.mail()
    expect(rows.length).toBe(before + 1)
    const row = rows.find((m) => m.subject === 'Ünïcode subject ✓')!
    expect(row.toAddress).toBe('"Parsed Person" <parsed@slipway.test>')
    expect(row.text.trim()).toBe('plain body')
    expect(row.html).toContain('<p>html body</p>')
  })
})
