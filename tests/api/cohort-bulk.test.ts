// Several members of a cohort at once: a message by e-mail to those chosen, and removal of those chosen
// (their accounts and attempts stay). One person who is not a member refuses the lot.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Cohort } from '../../shared/api'
import { UserEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort, expectStatus } from '../support/world'

describe('several members at once', () => {
  let api: TestApi
  let instructor: TestUser
  let ada: TestUser
  let abel: TestUser
  let cy: TestUser
  let outsider: TestUser
  let cohort: Cohort

  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor', { name: 'Ines Instructor' })
    const other = await api.createUser('instructor')
    ada = await api.createUser('apprentice', { name: 'Ada Apprentice' })
    abel = await api.createUser('apprentice', { name: 'Abel Apprentice' })
    cy = await api.createUser('apprentice', { name: 'Cy Apprentice' })
    outsider = await api.createUser('apprentice', { name: 'Otto Outsider' })
    cohort = await createCohort(api, instructor, 'Bulk cohort', [ada, abel, cy])
    await createCohort(api, other, 'Other cohort', [outsider])
  })
  afterAll(() => api.close())

  const message = (body: object) =>
    supertest(api.app).post(`/api/cohorts/${cohort.id}/messages`).set(bearer(instructor.token)).send(body)
  const remove = (userIds: string[]) =>
    supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/members/remove`)
      .set(bearer(instructor.token))
      .send({ userIds })
  const memberNames = async () =>
    (
      await expectStatus(
        supertest(api.app).get(`/api/cohorts/${cohort.id}/members`).set(bearer(instructor.token)),
        200,
      )
    ).body.items.map((m: { name: string }) => m.name)

  it('mails the message to the active members chosen, signed by the instructor', async () => {
    await api.dataSource.getRepository(UserEntity).update({ id: cy.user.id }, { active: false })
    const r = await expectStatus(
      message({
        userIds: [ada.user.id, cy.user.id],
        subject: 'Bench 3 is back',
        body: 'Bench 3 is repaired.\n\nBring your own meter leads on Thursday.',
      }),
      200,
    )
    expect(r.body).toEqual({ sent: 1 })
    const mail = (await api.mail()).filter((m) => m.subject === 'Bulk cohort: Bench 3 is back')
    expect(mail.map((m) => m.toAddress)).toEqual([ada.email])
    expect(mail[0]!.text).toContain('Bring your own meter leads on Thursday.')
    expect(mail[0]!.text).toContain('Ines Instructor, your instructor for Bulk cohort')
    await api.dataSource.getRepository(UserEntity).update({ id: cy.user.id }, { active: true })
  })

  it('asks for someone, a subject and a message, and refuses non-members', async () => {
    const empty = await expectStatus(message({ userIds: [], subject: 'x', body: 'y' }), 400)
    expect(empty.body.error.details.fields.userIds[0]).toBe('Choose at least one apprentice')
    const blank = await expectStatus(message({ userIds: [ada.user.id], subject: ' ', body: ' ' }), 400)
    expect(blank.body.error.details.fields).toMatchObject({
      subject: ['Write a subject'],
      body: ['Write a message'],
    })
    const before = (await api.mail()).length
    const r = await expectStatus(
      message({ userIds: [ada.user.id, outsider.user.id], subject: 's', body: 'b' }),
      400,
    )
    expect(r.body.error.details.fields.userIds[0]).toMatch(/1 of those chosen are not members/)
    expect((await api.mail()).length).toBe(before)
  })

  it('removes those chosen, all or none, keeping their accounts', async () => {
    await expectStatus(remove([ada.user.id, outsider.user.id]), 400)
    expect(await memberNames()).toHaveLength(3)
    const r = await expectStatus(remove([ada.user.id, abel.user.id]), 200)
    expect(r.body).toEqual({ removed: 2 })
    expect(await memberNames()).toEqual(['Cy Apprentice'])
    expect(await api.dataSource.getRepository(UserEntity).countBy({ id: ada.user.id })).toBe(1)
    // Already gone: no longer members, so the same request is refused.
    await expectStatus(remove([ada.user.id]), 400)
  })
})
