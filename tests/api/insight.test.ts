// Class insight through the API: one assignment and the cohort, from graded attempts, in words.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assignmentInsightSchema, cohortInsightSchema } from '../../shared/api'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { referenceFixtures } from '../support/shipped-attempts'
import { buildWorld, expectStatus, submit, type World } from '../support/world'

describe('class insight', () => {
  let api: TestApi
  let w: World

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    // Ada already failed once (the world's empty attempt); she passes at her second. Abel fails once.
    const reference = referenceFixtures().find((f) => f.scenario === 'two-wire-run-stop')!
    await expectStatus(
      submit(api, w.apprenticeA1, { assignmentId: w.assignmentA.id, events: reference.events }),
      201,
    )
    await expectStatus(submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id }), 201)
    await expectStatus(
      submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id, status: 'inProgress' }),
      201,
    )
    // Practice is not class work.
    await expectStatus(submit(api, w.apprenticeA2, { scenarioId: w.scenario.id }), 201)
  })
  afterAll(() => api.close())

  const get = async (path: string) =>
    (await expectStatus(supertest(api.app).get(path).set(bearer(w.instructorA.token)), 200)).body

  it('counts an assignment’s submitted attempts, its most missed objectives and the way to a pass', async () => {
    const r = assignmentInsightSchema.parse(await get(`/api/assignments/${w.assignmentA.id}/insight`))
    expect(r).toMatchObject({ title: w.assignmentA.title, apprentices: 2, submittedAttempts: 3 })
    expect(r.toPass).toMatchObject({ passed: 1, notYet: 1, notAttempted: 0, medianAttempts: 2 })
    expect(r.toPass.byAttempts.map((b) => b.apprentices)).toEqual([0, 1, 0, 0, 0])
    expect(r.toPass.medianMinutes).toBeGreaterThanOrEqual(0)
    // The reference solution meets every objective; the two empty attempts miss most (a safe-work objective
    // an empty log cannot break is met by them too). Most missed first.
    expect(r.objectives.length).toBeGreaterThan(0)
    for (const o of r.objectives) expect(o.graded).toBe(3)
    expect(r.objectives[0]).toMatchObject({ missed: 2, missRate: 2 / 3, notMetBy: 1 })
    const rates = r.objectives.map((o) => o.missRate!)
    expect(rates).toEqual([...rates].sort((a, b) => b - a))
    expect(r.objectives.map((o) => o.title).join(' ')).not.toMatch(/\b[a-z]+[A-Z][a-zA-Z]*\b/)
  })

  it('joins the cohort’s assignments', async () => {
    const r = cohortInsightSchema.parse(await get(`/api/cohorts/${w.cohortA.id}/insight`))
    expect(r.assignments.map((a) => a.title)).toEqual([w.assignmentA.title])
    expect(r.submittedAttempts).toBe(3)
    expect(r.objectives.every((o) => o.assignmentTitle === w.assignmentA.title)).toBe(true)
  })

  it('is for the cohort’s instructor only', async () => {
    await expectStatus(
      supertest(api.app).get(`/api/cohorts/${w.cohortA.id}/insight`).set(bearer(w.instructorB.token)),
      403,
    )
    await expectStatus(
      supertest(api.app)
        .get(`/api/assignments/${w.assignmentA.id}/insight`)
        .set(bearer(w.apprenticeA1.token)),
      403,
    )
  })
})
