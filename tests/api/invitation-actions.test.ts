// What staff do with a pending invitation — resend, copy a new link, withdraw — and the admins' list of
// everyone still invited; a roster imported valid rows only, the others skipped with their reasons.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  invitationLinkSchema,
  pendingInvitationListSchema,
  rosterImportResultSchema,
  type Cohort,
} from '../../shared/api'
import { InvitationEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort, expectStatus } from '../support/world'

const linkToken = (text: string) => decodeURIComponent(/invitation\?token=([^\s"<]+)/.exec(text)![1]!)

describe('pending invitations', () => {
  let api: TestApi
  let instructor: TestUser
  let other: TestUser
  let admin: TestUser
  let cohort: Cohort

  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    instructor = await api.createUser('instructor', { name: 'Perpetua Voss' })
    other = await api.createUser('instructor', { name: 'Osric Tallow' })
    admin = await api.createUser('admin', { name: 'Ada Min' })
    cohort = await createCohort(api, instructor, 'Winter intake', [])
  })
  afterAll(() => api.close())

  async function invite(email: string, name: string) {
    const response = await expectStatus(
      supertest(api.app)
        .post(`/api/cohorts/${cohort.id}/invitations`)
        .set(bearer(instructor.token))
        .send({ email, name }),
      201,
    )
    const mail = (await api.mail()).filter((m) => m.toAddress === email)
    return { id: response.body.invitation.id as string, token: linkToken(mail.at(-1)!.text) }
  }
  const preview = (token: string) => supertest(api.app).get(`/api/invitations/${encodeURIComponent(token)}`)
  const action = (who: TestUser, id: string, what: 'resend' | 'link') =>
    supertest(api.app).post(`/api/cohorts/${cohort.id}/invitations/${id}/${what}`).set(bearer(who.token))

  it('resends an invitation with a new link, a fresh week, and the old link no longer working', async () => {
    const first = await invite('rue.hollin@slipway.test', 'Rue Hollin')
    const before = await api.dataSource.getRepository(InvitationEntity).findOneByOrFail({ id: first.id })
    const response = await expectStatus(action(instructor, first.id, 'resend'), 200)
    expect(response.body.invitation.email).toBe('rue.hollin@slipway.test')
    const mails = (await api.mail()).filter((m) => m.toAddress === 'rue.hollin@slipway.test')
    expect(mails).toHaveLength(2)
    expect(mails[1]!.text).toContain('Perpetua Voss has invited you to join the cohort “Winter intake”')
    const fresh = linkToken(mails[1]!.text)
    expect(fresh).not.toBe(first.token)
    await expectStatus(preview(first.token), 404)
    expect((await expectStatus(preview(fresh), 200)).body.name).toBe('Rue Hollin')
    expect(response.body.invitation.expiresAt >= before.expiresAt).toBe(true)
  })

  it('makes a link to copy, sending no mail, and the mailed link stops working', async () => {
    const first = await invite('sable.ormond@slipway.test', 'Sable Ormond')
    const response = await expectStatus(action(instructor, first.id, 'link'), 200)
    const link = invitationLinkSchema.parse(response.body)
    expect(link.url).toMatch(/^http:\/\/slipway\.test\/invitation\?token=/)
    expect((await api.mail()).filter((m) => m.toAddress === 'sable.ormond@slipway.test')).toHaveLength(1)
    await expectStatus(preview(first.token), 404)
    await expectStatus(preview(new URL(link.url).searchParams.get('token')!), 200)
  })

  it('withdraws an invitation; then it can be neither resent nor copied', async () => {
    const first = await invite('tamsin.reave@slipway.test', 'Tamsin Reave')
    await expectStatus(
      supertest(api.app)
        .delete(`/api/cohorts/${cohort.id}/invitations/${first.id}`)
        .set(bearer(instructor.token)),
      204,
    )
    await expectStatus(preview(first.token), 404)
    expect((await expectStatus(action(instructor, first.id, 'resend'), 404)).body.error.message).toMatch(
      /Pending invitation/,
    )
    await expectStatus(action(instructor, first.id, 'link'), 404)
  })

  it('lets no other instructor act on the cohort’s invitations', async () => {
    const first = await invite('uma.stell@slipway.test', 'Uma Stell')
    await expectStatus(action(other, first.id, 'resend'), 403)
    await expectStatus(action(other, first.id, 'link'), 403)
    await expectStatus(preview(first.token), 200)
  })

  it('lists every pending invitation for admins, with cohort and inviter in names, and lets them act', async () => {
    await expectStatus(
      supertest(api.app)
        .post('/api/admin/invitations')
        .set(bearer(admin.token))
        .send({ email: 'vale.instructor@slipway.test', name: 'Vale Quill' }),
      201,
    )
    const list = pendingInvitationListSchema.parse(
      (await expectStatus(supertest(api.app).get('/api/admin/invitations').set(bearer(admin.token)), 200))
        .body,
    ).items
    const byEmail = new Map(list.map((i) => [i.email, i]))
    expect(byEmail.get('uma.stell@slipway.test')).toMatchObject({
      cohortName: 'Winter intake',
      invitedByName: 'Perpetua Voss',
      role: 'apprentice',
    })
    expect(byEmail.get('vale.instructor@slipway.test')).toMatchObject({
      cohortName: null,
      invitedByName: 'Ada Min',
      role: 'instructor',
    })
    expect(byEmail.has('tamsin.reave@slipway.test')).toBe(false) // withdrawn

    const vale = byEmail.get('vale.instructor@slipway.test')!
    await expectStatus(
      supertest(api.app).post(`/api/admin/invitations/${vale.id}/resend`).set(bearer(admin.token)),
      200,
    )
    expect((await api.mail()).filter((m) => m.toAddress === 'vale.instructor@slipway.test')).toHaveLength(2)
    invitationLinkSchema.parse(
      (
        await expectStatus(
          supertest(api.app).post(`/api/admin/invitations/${vale.id}/link`).set(bearer(admin.token)),
          200,
        )
      ).body,
    )
    await expectStatus(
      supertest(api.app).delete(`/api/admin/invitations/${vale.id}`).set(bearer(admin.token)),
      204,
    )
    await expectStatus(
      supertest(api.app).delete(`/api/admin/invitations/${vale.id}`).set(bearer(admin.token)),
      404,
    )
    await expectStatus(supertest(api.app).get('/api/admin/invitations').set(bearer(instructor.token)), 403)
  })

  it('pages the list for admins: every pending invitation once, newest first, and a bad page is a 400', async () => {
    for (let i = 0; i < 3; i++) await invite(`paged.${i}@slipway.test`, `Paged Person ${i}`)
    const pageOf = async (page: number) =>
      pendingInvitationListSchema.parse(
        (
          await expectStatus(
            supertest(api.app).get(`/api/admin/invitations?page=${page}&pageSize=2`).set(bearer(admin.token)),
            200,
          )
        ).body,
      )
    const first = await pageOf(1)
    expect(first.items).toHaveLength(2)
    const pages = Math.ceil(first.total / 2)
    const all = [first, ...(await Promise.all(Array.from({ length: pages - 1 }, (_, i) => pageOf(i + 2))))]
    const emails = all.flatMap((p) => p.items.map((i) => i.email))
    expect(emails).toHaveLength(first.total)
    expect(new Set(emails).size).toBe(first.total)
    const created = all.flatMap((p) => p.items.map((i) => i.createdAt))
    expect([...created].sort().reverse()).toEqual(created)
    expect(emails).toContain('paged.2@slipway.test')
    const bad = await expectStatus(
      supertest(api.app).get('/api/admin/invitations?page=0').set(bearer(admin.token)),
      400,
    )
    expect(bad.body.error.message).toBeTruthy()
  })
})

describe('importing the valid rows of a roster', () => {
  let api: TestApi
  let instructor: TestUser
  let cohort: Cohort
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    instructor = await api.createUser('instructor')
    await api.createUser('instructor', { email: 'taken.staff@slipway.test' })
    cohort = await createCohort(api, instructor, 'Roster cohort', [])
  })
  afterAll(() => api.close())

  const upload = (csv: string, rows?: string) =>
    supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations/roster${rows ? `?rows=${rows}` : ''}`)
      .set(bearer(instructor.token))
      .attach('roster', Buffer.from(csv), { filename: 'roster.csv', contentType: 'text/csv' })

  const csv = [
    'name,email',
    'Wren Maddox,wren.maddox@slipway.test',
    'No Address,not-an-address',
    'Staff Member,taken.staff@slipway.test',
    'Olu Brisk,olu.brisk@slipway.test',
  ].join('\n')

  it('still imports nothing from a file with problems by default', async () => {
    const refused = await expectStatus(upload(csv), 400)
    expect(refused.body.error.details.rows.map((r: { row: number }) => r.row)).toEqual([3])
    expect(await api.dataSource.getRepository(InvitationEntity).countBy({ cohortId: cohort.id })).toBe(0)
  })

  it('imports the valid rows and says which were skipped and why', async () => {
    const result = rosterImportResultSchema.parse((await expectStatus(upload(csv, 'valid'), 201)).body)
    expect(result.items.map((i) => i.email)).toEqual(['wren.maddox@slipway.test', 'olu.brisk@slipway.test'])
    expect(result.skipped).toEqual([
      { row: 3, field: 'email', message: 'Must be an e-mail address' },
      { row: 4, field: 'email', message: 'taken.staff@slipway.test already has an account' },
    ])
    const mail = (await api.mail()).map((m) => m.toAddress).sort()
    expect(mail).toEqual(['olu.brisk@slipway.test', 'wren.maddox@slipway.test'])
  })

  it('refuses when no row can be imported, and a file it cannot read at all', async () => {
    await expectStatus(upload('name,email\nNo Address,nope\n', 'valid'), 400)
    await expectStatus(upload('who,where\nx,y\n', 'valid'), 400)
    await expectStatus(upload(csv, 'some'), 400)
  })
})
