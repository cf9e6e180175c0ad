// Work set for chosen apprentices only: they are told and may attempt it; the rest neither see it nor may
// submit; the gradebook leaves it out of their completion; the choice can be widened later.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assignmentSchema, gradebookSchema, type Assignment, type Cohort } from '../../shared/api'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort, expectStatus, submit } from '../support/world'

const days = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString()

describe('work set for chosen apprentices', () => {
  let api: TestApi
  let instructor: TestUser
  let ada: TestUser
  let abel: TestUser
  let outsider: TestUser
  let cohort: Cohort
  let scenarioId: string
  let chosen: Assignment

  const create = (body: object) =>
    supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/assignments`)
      .set(bearer(instructor.token))
      .send({
        scenarioId,
        opensAt: days(-1),
        dueAt: days(5),
        attemptLimit: null,
        hintsAllowed: true,
        ...body,
      })
  const list = async (who: TestUser) =>
    (await expectStatus(supertest(api.app).get('/api/assignments').set(bearer(who.token)), 200)).body
      .items as Assignment[]

  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor')
    const otherInstructor = await api.createUser('instructor')
    ada = await api.createUser('apprentice', { name: 'Ada Apprentice' })
    abel = await api.createUser('apprentice', { name: 'Abel Apprentice' })
    outsider = await api.createUser('apprentice', { name: 'Otto Outsider' })
    cohort = await createCohort(api, instructor, 'Targeted cohort', [ada, abel])
    await createCohort(api, otherInstructor, 'Other cohort', [outsider])
    const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(instructor.token))).body
    scenarioId = scenarios.items.find((s: { key: string }) => s.key === 'two-wire-run-stop').id
  })
  afterAll(() => api.close())

  it('is set for those chosen, who alone are told by mail', async () => {
    const r = await expectStatus(create({ title: 'Catch-up run-stop', apprenticeIds: [ada.user.id] }), 201)
    chosen = assignmentSchema.parse(r.body)
    expect(chosen.targeted).toBe(true)
    const told = (await api.mail()).filter((m) => m.subject === 'New assignment: Catch-up run-stop')
    expect(told.map((m) => m.toAddress)).toEqual([ada.email])
  })

  it('is seen and attempted by those chosen only', async () => {
    expect((await list(ada)).map((a) => a.id)).toContain(chosen.id)
    expect((await list(abel)).map((a) => a.id)).not.toContain(chosen.id)
    await expectStatus(supertest(api.app).get(`/api/assignments/${chosen.id}`).set(bearer(ada.token)), 200)
    await expectStatus(supertest(api.app).get(`/api/assignments/${chosen.id}`).set(bearer(abel.token)), 403)
    await expectStatus(submit(api, ada, { assignmentId: chosen.id }), 201)
    const refused = await expectStatus(submit(api, abel, { assignmentId: chosen.id }), 403)
    expect(refused.body.error.message).toBe('This assignment is not set for you')
  })

  it('shows the rest as not set in the gradebook, outside their completion', async () => {
    const gradebook = gradebookSchema.parse(
      (
        await expectStatus(
          supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook`).set(bearer(instructor.token)),
          200,
        )
      ).body,
    )
    const column = gradebook.assignments.findIndex((a) => a.id === chosen.id)
    expect(gradebook.assignments[column]!.targeted).toBe(true)
    const abelRow = gradebook.rows.find((r) => r.userId === abel.user.id)!
    expect(abelRow.cells[column]!.status).toBe('notAssigned')
    expect(abelRow.completion.assigned).toBe(0)
    const adaRow = gradebook.rows.find((r) => r.userId === ada.user.id)!
    expect(adaRow.completion.assigned).toBe(1)
  })

  it('refuses anyone outside the cohort, and an empty choice', async () => {
    const r = await expectStatus(create({ apprenticeIds: [ada.user.id, outsider.user.id] }), 400)
    expect(r.body.error.details.fields.apprenticeIds[0]).toMatch(/1 of those named are not members/)
    await expectStatus(create({ apprenticeIds: [] }), 400)
    expect((await list(instructor)).filter((a) => a.cohortId === cohort.id)).toHaveLength(1)
  })

  it('widens to the whole cohort later, telling only those newly set', async () => {
    const before = (await api.mail()).length
    const r = await expectStatus(
      supertest(api.app)
        .patch(`/api/assignments/${chosen.id}`)
        .set(bearer(instructor.token))
        .send({ apprenticeIds: null }),
      200,
    )
    expect(r.body.targeted).toBe(false)
    const mail = (await api.mail())
      .slice(before)
      .filter((m) => m.subject === 'New assignment: Catch-up run-stop')
    expect(mail.map((m) => m.toAddress)).toEqual([abel.email])
    expect((await list(abel)).map((a) => a.id)).toContain(chosen.id)
    await expectStatus(submit(api, abel, { assignmentId: chosen.id }), 201)
  })
})
