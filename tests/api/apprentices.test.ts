// One apprentice's record for their instructors, and the way from one attempt's review to the next
// apprentice's.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { apprenticeRecordSchema, attemptNeighboursSchema, type ApprenticeRecord } from '../../shared/api'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { referenceFixtures } from '../support/shipped-attempts'
import { buildWorld, expectStatus, submit, type World } from '../support/world'

describe('the apprentice page', () => {
  let api: TestApi
  let w: World
  let practiceId: string
  let passId: string

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    const practice = await expectStatus(submit(api, w.apprenticeA1, { scenarioId: w.scenario.id }), 201)
    practiceId = practice.body.id
    const reference = referenceFixtures().find((f) => f.scenario === 'two-wire-run-stop')!
    const pass = await expectStatus(
      submit(api, w.apprenticeA1, { assignmentId: w.assignmentA.id, events: reference.events }),
      201,
    )
    passId = pass.body.id
    expect(pass.body.grade.passed).toBe(true)
    await expectStatus(
      supertest(api.app)
        .post(`/api/attempts/${w.attemptA1.id}/feedback`)
        .set(bearer(w.instructorA.token))
        .send({ body: 'Prove dead before you touch a terminal.' }),
      201,
    )
  })
  afterAll(() => api.close())

  const record = async (who: TestUser, id = w.apprenticeA1.user.id): Promise<ApprenticeRecord> =>
    apprenticeRecordSchema.parse(
      (await expectStatus(supertest(api.app).get(`/api/apprentices/${id}`).set(bearer(who.token)), 200)).body,
    )

  it('lists every assignment under their terms and every attempt, practice too, newest first', async () => {
    const r = await record(w.instructorA)
    expect(r.apprentice).toMatchObject({ name: 'Ada Apprentice', email: w.apprenticeA1.email })
    expect(r.cohorts.map((c) => c.name)).toEqual(['Cohort A'])
    expect(r.assignments).toHaveLength(1)
    expect(r.assignments[0]).toMatchObject({ assignmentId: w.assignmentA.id, status: 'passed', attempts: 2 })
    expect(r.attempts.map((a) => a.id)).toEqual(expect.arrayContaining([w.attemptA1.id, practiceId, passId]))
    const practice = r.attempts.find((a) => a.id === practiceId)!
    expect(practice).toMatchObject({ assignmentId: null, assignmentTitle: null })
    expect(practice.scenarioTitle).toBe(w.scenario.title)
    expect(r.summary).toMatchObject({ passed: 1, assigned: 1, practiceAttempts: 1 })
    for (const a of r.attempts) expect(a.minutes).toBeGreaterThanOrEqual(0)
    const starts = r.attempts.map((a) => a.startedAt)
    expect(starts).toEqual([...starts].sort().reverse())
  })

  it('dates each learning outcome from the first passed attempt of its scenario', async () => {
    const r = await record(w.instructorA)
    expect(r.outcomes.length).toBeGreaterThan(0)
    const pass = r.attempts.find((a) => a.id === passId)!
    for (const o of r.outcomes) expect(o).toMatchObject({ metAt: pass.submittedAt, attemptId: passId })
  })

  it('carries the feedback given, with the exercise and its author', async () => {
    const r = await record(w.instructorA)
    expect(r.feedback[0]).toMatchObject({
      attemptId: w.attemptA1.id,
      exercise: w.assignmentA.title,
      authorName: 'Ines Instructor-A',
      body: 'Prove dead before you touch a terminal.',
    })
  })

  it('is for the instructors of their cohorts and admins only', async () => {
    await record(w.admin)
    const other = await supertest(api.app)
      .get(`/api/apprentices/${w.apprenticeA1.user.id}`)
      .set(bearer(w.instructorB.token))
    expect(other.status).toBe(403)
    const notApprentice = await supertest(api.app)
      .get(`/api/apprentices/${w.instructorB.user.id}`)
      .set(bearer(w.admin.token))
    expect(notApprentice.status).toBe(404)
  })

  it('lets the instructors of their cohorts open their free practice, and no other', async () => {
    await expectStatus(
      supertest(api.app).get(`/api/attempts/${practiceId}`).set(bearer(w.instructorA.token)),
      200,
    )
    await expectStatus(
      supertest(api.app).get(`/api/attempts/${practiceId}`).set(bearer(w.instructorB.token)),
      403,
    )
  })

  it('steps from one apprentice’s attempt to the next apprentice’s on the same assignment, by name', async () => {
    const abel = await expectStatus(submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id }), 201)
    const fromAda = attemptNeighboursSchema.parse(
      (
        await expectStatus(
          supertest(api.app)
            .get(`/api/attempts/${w.attemptA1.id}/neighbours`)
            .set(bearer(w.instructorA.token)),
          200,
        )
      ).body,
    )
    // Abel comes before Ada; Ada's latest submitted attempt is her pass.
    expect(fromAda).toEqual({
      position: 2,
      of: 2,
      previous: { attemptId: abel.body.id, userName: 'Abel Apprentice' },
      next: null,
    })
    const fromAbel = (
      await supertest(api.app)
        .get(`/api/attempts/${abel.body.id}/neighbours`)
        .set(bearer(w.instructorA.token))
    ).body
    expect(fromAbel.next).toEqual({ attemptId: passId, userName: 'Ada Apprentice' })
  })
})
