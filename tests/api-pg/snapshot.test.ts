// The driver-neutral table snapshot that "changed nothing" tests compare, on whichever database runs.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { snapshotTables } from '../support/test-database'

describe('table snapshot', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api?.close())

  it('covers every table the migrations create', async () => {
    const tables = (await snapshotTables(api.dataSource)).map((t) => t.table)
    const expected = api.dataSource.entityMetadatas.map((m) => m.tableName)
    expect(tables).toEqual(expect.arrayContaining([...expected, 'migrations']))
  })

  it('changes when a request writes and stays the same when it is refused', async () => {
    const admin = await api.createUser('admin')
    const before = JSON.stringify(await snapshotTables(api.dataSource))
    const refused = await supertest(api.app).post('/api/cohorts').set(bearer(admin.token)).send({ name: '' })
    expect(refused.status).toBe(400)
    expect(JSON.stringify(await snapshotTables(api.dataSource))).toBe(before)
    const created = await supertest(api.app)
      .post('/api/cohorts')
      .set(bearer(admin.token))
      .send({ name: 'Night class' })
    expect(created.status).toBe(201)
    expect(JSON.stringify(await snapshotTables(api.dataSource))).not.toBe(before)
  })
})
