// A request passes through several routers mounted on the same path (/api/cohorts has three); the account
// behind its token is read once, not once per router (each read was a query on every request).
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, type World } from '../support/world'

describe('signing a request in once', () => {
  let api: TestApi
  let w: World
  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  it('reads the account once for a route behind several routers', async () => {
    const logged = vi.spyOn(api.dataSource.logger, 'logQuery')
    const response = await supertest(api.app)
      .get(`/api/cohorts/${w.cohortA.id}/gradebook`)
      .set(bearer(w.instructorA.token))
    expect(response.status).toBe(200)
    // SQLite numbers no placeholders ("?"); PostgreSQL does ("$1").
    const accountReads = logged.mock.calls.filter(([sql]) => /FROM "users" WHERE "id" = (\?|\$1)/.test(sql))
    logged.mockRestore()
    expect(accountReads).toHaveLength(1)
  })
})
