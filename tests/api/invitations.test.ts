// Invitations by e-mail: one address, a roster CSV (all or nothing, per-row errors), instructor invites,
// and accepting by setting a password from the link in the outbox.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { inviteOutcomeSchema, invitationPreviewSchema, sessionResponseSchema } from '../../shared/api'
import { EnrollmentEntity, InvitationEntity, UploadEntity, UserEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort } from '../support/world'
import type { Cohort } from '../../shared/api'

const linkToken = (text: string) => decodeURIComponent(/invitation\?token=([^\s"<]+)/.exec(text)![1]!)

describe('invitations', () => {
  let api: TestApi
  let instructor: TestUser
  let admin: TestUser
  let cohort: Cohort
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    instructor = await api.createUser('instructor', { name: 'Perpetua Voss' })
    admin = await api.createUser('admin')
    cohort = await createCohort(api, instructor, 'Winter intake', [])
  })
  afterAll(() => api.close())

  const roster = (csv: string, name = 'roster.csv', type = 'text/csv') =>
    supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations/roster`)
      .set(bearer(instructor.token))
      .attach('roster', Buffer.from(csv), { filename: name, contentType: type })

  it('e-mails an invitation whose link lets the invitee choose a password and join the cohort', async () => {
    const response = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: 'Yusra.Kettleby@Slipway.test', name: 'Yusra Kettleby' })
    expect(response.status).toBe(201)
    expect(inviteOutcomeSchema.parse(response.body).outcome).toBe('invited')

    const message = (await api.mail()).find((m) => m.toAddress.includes('yusra.kettleby@slipway.test'))!
    expect(message.subject).toBe('You are invited to Winter intake on Slipway')
    expect(message.text).toContain('Perpetua Voss has invited you to join the cohort “Winter intake”')
    expect(message.html).toContain('href="http://slipway.test/invitation?token=')
    const token = linkToken(message.text)

    const preview = invitationPreviewSchema.parse(
      (await supertest(api.app).get(`/api/invitations/${token}`)).body,
    )
    expect(preview).toMatchObject({
      email: 'yusra.kettleby@slipway.test',
      cohortName: 'Winter intake',
      role: 'apprentice',
    })

    const accepted = await supertest(api.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'my own bench password' })
    expect(accepted.status).toBe(201)
    const session = sessionResponseSchema.parse(accepted.body)
    expect(session.user.role).toBe('apprentice')
    expect(
      await api.dataSource
        .getRepository(EnrollmentEntity)
        .countBy({ cohortId: cohort.id, userId: session.user.id }),
    ).toBe(1)

    const twice = await supertest(api.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'my own bench password' })
    expect(twice.status).toBe(404)
    expect(twice.body.error.code).toBe('invitation_invalid')
  })

  it('honours every pending cohort invitation of the address when one is accepted', async () => {
    const second = await createCohort(api, instructor, 'Night class', [])
    for (const target of [cohort, second]) {
      await supertest(api.app)
        .post(`/api/cohorts/${target.id}/invitations`)
        .set(bearer(instructor.token))
        .send({ email: 'twice@slipway.test', name: 'Twice Invited' })
    }
    const link = (await api.mail()).find((m) => m.toAddress === 'twice@slipway.test')!
    const accepted = await supertest(api.app)
      .post(`/api/invitations/${linkToken(link.text)}/accept`)
      .send({ password: 'one password for both' })
    expect(accepted.status).toBe(201)
    const enrolments = await api.dataSource
      .getRepository(EnrollmentEntity)
      .findBy({ userId: accepted.body.user.id })
    expect(enrolments.map((e) => e.cohortId).sort()).toEqual([cohort.id, second.id].sort())
  })

  it('withdraws a pending invitation so its link stops working', async () => {
    const invited = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: 'withdrawn@slipway.test', name: 'Changed Mind' })
    const token = linkToken((await api.mail()).find((m) => m.toAddress === 'withdrawn@slipway.test')!.text)
    const withdrawn = await supertest(api.app)
      .delete(`/api/cohorts/${cohort.id}/invitations/${invited.body.invitation.id}`)
      .set(bearer(instructor.token))
    expect(withdrawn.status).toBe(204)
    expect((await supertest(api.app).get(`/api/invitations/${token}`)).status).toBe(404)
    const pending = await supertest(api.app)
      .get(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
    expect(pending.body.items.map((i: { email: string }) => i.email)).not.toContain('withdrawn@slipway.test')
  })

  it('refuses an invitation link after it expires', async () => {
    await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: 'expired@slipway.test', name: 'Too Late' })
    const token = linkToken((await api.mail()).find((m) => m.toAddress === 'expired@slipway.test')!.text)
    await api.dataSource
      .getRepository(InvitationEntity)
      .update({ email: 'expired@slipway.test' }, { expiresAt: new Date(Date.now() - 1000).toISOString() })
    const response = await supertest(api.app)
      .post(`/api/invitations/${token}/accept`)
      .send({ password: 'a perfectly good password' })
    expect(response.status).toBe(404)
    expect(response.body.error.code).toBe('invitation_invalid')
    expect(await api.dataSource.getRepository(UserEntity).countBy({ email: 'expired@slipway.test' })).toBe(0)
  })

  it('refuses a weak password on acceptance, keeping the invitation usable', async () => {
    await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: 'weak@slipway.test', name: 'Weak Password' })
    const token = linkToken((await api.mail()).find((m) => m.toAddress.includes('weak@slipway.test'))!.text)
    const weak = await supertest(api.app).post(`/api/invitations/${token}/accept`).send({ password: 'short' })
    expect(weak.status).toBe(400)
    expect(weak.body.error.details.fields.password[0]).toMatch(/at least 12/)
    expect((await supertest(api.app).get(`/api/invitations/${token}`)).status).toBe(200)
  })

  it('enrols an apprentice who already has an account instead of inviting them', async () => {
    const existing = await api.createUser('apprentice')
    const response = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(instructor.token))
      .send({ email: existing.email, name: existing.user.name })
    expect(response.status).toBe(201)
    expect(response.body.outcome).toBe('enrolled')
  })

  it('imports a clean roster CSV, columns in any order, inviting every row', async () => {
    const response = await roster(
      'E-mail,Name\nodile.brack@slipway.test,Odile Brack\n"teo.marsh@slipway.test","Marsh, Teo"\n',
    )
    expect(response.status).toBe(201)
    expect(response.body.items.map((i: { outcome: string }) => i.outcome)).toEqual(['invited', 'invited'])
    const invited = await api.dataSource
      .getRepository(InvitationEntity)
      .findOneByOrFail({ email: 'teo.marsh@slipway.test' })
    expect(invited.name).toBe('Marsh, Teo')
    expect(await api.dataSource.getRepository(UploadEntity).countBy({ purpose: 'roster' })).toBe(1)
  })

  it('reports every bad row of a roster and imports nothing', async () => {
    const before = await api.dataSource.getRepository(InvitationEntity).count()
    const response = await roster(
      'name,email\nGood Person,good.person@slipway.test\n,missing.name@slipway.test\nBad Address,not-an-email\nDupe One,dupe@slipway.test\nDupe Two,dupe@slipway.test\n',
    )
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('roster_invalid')
    expect(response.body.error.details.rows).toEqual([
      { row: 3, field: 'name', message: 'Enter a name' },
      { row: 4, field: 'email', message: 'Must be an e-mail address' },
      { row: 6, field: 'email', message: 'Same address as row 5' },
    ])
    expect(await api.dataSource.getRepository(InvitationEntity).count()).toBe(before)
    expect(
      await api.dataSource.getRepository(UserEntity).countBy({ email: 'good.person@slipway.test' }),
    ).toBe(0)
  })

  it('rolls back the whole roster when one row clashes with a staff account', async () => {
    const before = await api.dataSource.getRepository(InvitationEntity).count()
    const response = await roster(`name,email\nFine Row,fine.row@slipway.test\nStaff Clash,${admin.email}\n`)
    expect(response.status).toBe(400)
    expect(response.body.error.details.rows[0]).toMatchObject({ row: 3, field: 'email' })
    expect(await api.dataSource.getRepository(InvitationEntity).count()).toBe(before)
  })

  it('refuses a roster that needs a header row', async () => {
    const response = await roster('someone@slipway.test,Someone\n')
    expect(response.status).toBe(400)
    expect(response.body.error.details.rows[0].field).toBe('(header)')
  })

  it('answers a roster that is not a CSV file with 415', async () => {
    const response = await roster('%PDF-1.7 pretend', 'roster.pdf', 'application/pdf')
    expect(response.status).toBe(415)
    expect(response.body.error.code).toBe('unsupported_media_type')
  })

  it('answers a roster over the size limit with 413', async () => {
    const big = 'name,email\n' + 'A Person,a@slipway.test\n'.repeat(12_000)
    const response = await roster(big)
    expect(response.status).toBe(413)
  })

  it('lets an admin invite an instructor, who joins with the instructor role', async () => {
    const response = await supertest(api.app)
      .post('/api/admin/invitations')
      .set(bearer(admin.token))
      .send({ email: 'new.instructor@slipway.test', name: 'Hollis Grange' })
    expect(response.status).toBe(201)
    const message = (await api.mail()).find((m) => m.toAddress.includes('new.instructor@slipway.test'))!
    expect(message.subject).toBe('You are invited to Slipway')
    const accepted = await supertest(api.app)
      .post(`/api/invitations/${linkToken(message.text)}/accept`)
      .send({ password: 'instructor password here' })
    expect(accepted.status).toBe(201)
    expect(accepted.body.user.role).toBe('instructor')
  })

  it('does not let an instructor invite into another instructor’s cohort', async () => {
    const other = await api.createUser('instructor')
    const response = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(other.token))
      .send({ email: 'sneaky@slipway.test', name: 'Sneaky' })
    expect(response.status).toBe(403)
  })
})
