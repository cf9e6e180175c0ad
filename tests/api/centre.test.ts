// Centre settings: the name and the time zone every date is shown in; admins change them, with an audit.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { centreSettingsSchema } from '../../shared/api'
import { centreTimeZone } from '../../server/centre/centre.service'
import { AuditEntryEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { buildWorld, createAssignment, expectStatus, type World } from '../support/world'

describe('centre settings', () => {
  let api: TestApi
  let admin: TestUser
  let world: World

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    admin = world.admin
  })
  afterAll(() => api.close())

  it('shows UTC and a plain name until an admin chooses', async () => {
    const res = await expectStatus(
      supertest(api.app).get('/api/centre').set(bearer(world.apprenticeA1.token)),
      200,
    )
    expect(centreSettingsSchema.parse(res.body)).toEqual({
      name: 'Training centre',
      timeZone: 'UTC',
      updatedAt: null,
    })
    expect(await centreTimeZone(api.dataSource)).toBe('UTC')
  })

  it('takes a name and an IANA time zone, audited, and other features read the zone', async () => {
    const res = await expectStatus(
      supertest(api.app)
        .patch('/api/centre')
        .set(bearer(admin.token))
        .send({ name: 'Heron Quay Training Centre', timeZone: 'Asia/Kolkata' }),
      200,
    )
    expect(res.body).toMatchObject({ name: 'Heron Quay Training Centre', timeZone: 'Asia/Kolkata' })
    expect(await centreTimeZone(api.dataSource)).toBe('Asia/Kolkata')
    const audit = await api.dataSource
      .getRepository(AuditEntryEntity)
      .findOneByOrFail({ action: 'centre.updated' })
    expect(JSON.parse(audit.toValue)).toEqual({
      name: 'Heron Quay Training Centre',
      timeZone: 'Asia/Kolkata',
    })
  })

  it('refuses a time zone that is not one, with a field error, and changes nothing', async () => {
    const res = await supertest(api.app)
      .patch('/api/centre')
      .set(bearer(admin.token))
      .send({ timeZone: 'Atlantis/Central' })
    expect(res.status).toBe(400)
    expect(res.body.error.details.fields).toHaveProperty('timeZone')
    expect(await centreTimeZone(api.dataSource)).toBe('Asia/Kolkata')
  })

  it('writes due dates in mail on the centre’s clock', async () => {
    await createAssignment(api, world.instructorA, world.cohortA, world.scenario.id, {
      title: 'Clocked job',
      dueAt: '2030-06-01T12:00:00.000Z',
    })
    const mail = (await api.mail()).filter((m) => m.subject === 'New assignment: Clocked job')
    expect(mail.length).toBeGreaterThan(0)
    // 12:00 UTC is 17:30 in India (UTC+5:30, no daylight saving; tz database).
    expect(mail[0]!.text).toMatch(/due by 1 Jun 2030, 17:30 GMT\+5:30/)
  })
})
