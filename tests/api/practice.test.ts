// Free practice per cohort: every scenario open by default; an instructor closes some; apprentices of that
// cohort no longer see them or may save practice of them (403 in words); the instructor sees practice counts.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { cohortPracticeSchema, practiceListSchema, type CohortPractice } from '../../shared/api'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { buildWorld, expectStatus, submit, type World } from '../support/world'

describe('the practice policy', () => {
  let api: TestApi
  let w: World

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  const list = async (who: TestUser) =>
    practiceListSchema.parse(
      (await expectStatus(supertest(api.app).get('/api/practice').set(bearer(who.token)), 200)).body,
    )
  const policy = async (who: TestUser, body: object, status = 200) =>
    (
      await expectStatus(
        supertest(api.app).put(`/api/cohorts/${w.cohortA.id}/practice`).set(bearer(who.token)).send(body),
        status,
      )
    ).body
  const page = async (): Promise<CohortPractice> =>
    cohortPracticeSchema.parse(
      (
        await expectStatus(
          supertest(api.app).get(`/api/cohorts/${w.cohortA.id}/practice`).set(bearer(w.instructorA.token)),
          200,
        )
      ).body,
    )

  it('leaves every scenario open until an instructor chooses', async () => {
    const all = await list(w.admin)
    const mine = await list(w.apprenticeA1)
    expect(mine.items.map((s) => s.key)).toEqual(all.items.map((s) => s.key))
    expect(mine.closed).toBe(0)
    expect((await page()).policy).toEqual({ mode: 'all' })
    await expectStatus(submit(api, w.apprenticeA1, { scenarioId: w.scenario.id }), 201)
  })

  it('counts each apprentice’s practice and each scenario’s, for the cohort’s instructor', async () => {
    await expectStatus(submit(api, w.apprenticeA1, { scenarioId: w.scenario.id, status: 'inProgress' }), 201)
    const p = await page()
    const ada = p.apprentices.find((a) => a.userId === w.apprenticeA1.user.id)!
    expect(ada).toMatchObject({ name: 'Ada Apprentice', attempts: 2, submitted: 1, passed: 0 })
    expect(ada.lastAt).not.toBeNull()
    expect(p.apprentices.find((a) => a.userId === w.apprenticeA2.user.id)).toMatchObject({
      attempts: 0,
      lastAt: null,
    })
    expect(p.scenarios.find((s) => s.key === w.scenario.key)).toMatchObject({
      open: true,
      attempts: 2,
      apprentices: 1,
    })
    // Assigned work is not practice.
    expect(p.apprentices.reduce((n, a) => n + a.attempts, 0)).toBe(2)
  })

  it('hides a closed scenario from the cohort’s apprentices and refuses their practice of it in words', async () => {
    const others = (await list(w.admin)).items.map((s) => s.key).filter((k) => k !== w.scenario.key)
    const saved = cohortPracticeSchema.parse(await policy(w.instructorA, { mode: 'chosen', keys: others }))
    expect(saved.scenarios.find((s) => s.key === w.scenario.key)?.open).toBe(false)

    const mine = await list(w.apprenticeA1)
    expect(mine.items.map((s) => s.key)).not.toContain(w.scenario.key)
    expect(mine.closed).toBe(1)
    const refused = await expectStatus(submit(api, w.apprenticeA1, { scenarioId: w.scenario.id }), 403)
    expect(refused.body.error.code).toBe('practice_closed')
    expect(refused.body.error.message).toContain(w.scenario.title)
    expect(refused.body.error.message).toContain('Cohort A')
    const check = await expectStatus(
      supertest(api.app).get(`/api/practice/${w.scenario.key}`).set(bearer(w.apprenticeA2.token)),
      403,
    )
    expect(check.body.error.code).toBe('practice_closed')
  })

  it('keeps assigned work of a closed scenario, other cohorts and staff unaffected', async () => {
    await expectStatus(submit(api, w.apprenticeA1, { assignmentId: w.assignmentA.id }), 201)
    expect((await list(w.apprenticeB1)).closed).toBe(0)
    await expectStatus(submit(api, w.apprenticeB1, { scenarioId: w.scenario.id }), 201)
    await expectStatus(submit(api, w.instructorA, { scenarioId: w.scenario.id }), 201)
  })

  it('refuses keys the library does not hold, and opens everything again', async () => {
    const bad = await policy(w.instructorA, { mode: 'chosen', keys: ['no-such-exercise'] }, 400)
    expect(bad.error.details.fields.keys[0]).toContain('no-such-exercise')
    await policy(w.instructorA, { mode: 'sometimes' }, 400)
    await policy(w.instructorA, { mode: 'all' })
    expect((await list(w.apprenticeA1)).closed).toBe(0)
    await expectStatus(submit(api, w.apprenticeA1, { scenarioId: w.scenario.id }), 201)
  })

  it('opens an apprentice’s practice attempt for review to their instructor only', async () => {
    const practice = await expectStatus(submit(api, w.apprenticeA2, { scenarioId: w.scenario.id }), 201)
    const path = `/api/attempts/${practice.body.id}/overview`
    const seen = await expectStatus(supertest(api.app).get(path).set(bearer(w.instructorA.token)), 200)
    expect(seen.body).toMatchObject({ assignmentId: null, userId: w.apprenticeA2.user.id })
    await expectStatus(supertest(api.app).get(path).set(bearer(w.instructorB.token)), 403)
    await expectStatus(
      supertest(api.app).get(`/api/attempts/${practice.body.id}/neighbours`).set(bearer(w.instructorA.token)),
      200,
    )
  })

  it('lets only the cohort’s instructor change its policy', async () => {
    await policy(w.instructorB, { mode: 'all' }, 403)
    await policy(w.apprenticeA1, { mode: 'all' }, 403)
  })
})
