// Cohorts and assignments: owned by their instructor, seen by their apprentices, archived when done.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assignmentListSchema, cohortListSchema, cohortMemberListSchema } from '../../shared/api'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, createAssignment, submit, type World } from '../support/world'

describe('cohorts and assignments', () => {
  let api: TestApi
  let w: World
  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  const get = (path: string, token: string) => supertest(api.app).get(path).set(bearer(token))

  it('lists for each role only the cohorts they may see', async () => {
    const names = async (token: string) =>
      cohortListSchema.parse((await get('/api/cohorts', token)).body).items.map((c) => c.name)
    expect(await names(w.apprenticeA1.token)).toEqual(['Cohort A'])
    expect(await names(w.instructorB.token)).toEqual(['Cohort B'])
    expect((await names(w.admin.token)).sort()).toEqual(['Cohort A', 'Cohort B'])
  })

  it('counts and lists members for the cohort’s instructor', async () => {
    const cohort = (await get(`/api/cohorts/${w.cohortA.id}`, w.instructorA.token)).body
    expect(cohort.memberCount).toBe(2)
    const members = cohortMemberListSchema.parse(
      (await get(`/api/cohorts/${w.cohortA.id}/members`, w.instructorA.token)).body,
    )
    expect(members.items.map((m) => m.name)).toEqual(['Abel Apprentice', 'Ada Apprentice'])
  })

  it('lets an admin create a cohort for an instructor, but not an instructor for someone else', async () => {
    const byAdmin = await supertest(api.app)
      .post('/api/cohorts')
      .set(bearer(w.admin.token))
      .send({ name: 'Evening class', ownerId: w.instructorB.user.id })
    expect(byAdmin.status).toBe(201)
    expect(byAdmin.body.ownerName).toBe('Bram Instructor-B')
    const byInstructor = await supertest(api.app)
      .post('/api/cohorts')
      .set(bearer(w.instructorA.token))
      .send({ name: 'Not mine', ownerId: w.instructorB.user.id })
    expect(byInstructor.status).toBe(403)
  })

  it('shows an apprentice their cohort’s assignments with their own progress', async () => {
    const list = assignmentListSchema.parse((await get('/api/assignments', w.apprenticeA1.token)).body)
    expect(list.items.map((a) => a.id)).toEqual([w.assignmentA.id])
    expect(list.items[0]!.myProgress).toMatchObject({ attemptsUsed: 1, passed: false })
    expect(list.items[0]!.scenarioKey).toBe('two-wire-run-stop')
    expect(list.items[0]!.scenarioTitle).toBe(w.scenario.title)
  })

  it('validates assignment dates with a field error', async () => {
    const response = await supertest(api.app)
      .post(`/api/cohorts/${w.cohortA.id}/assignments`)
      .set(bearer(w.instructorA.token))
      .send({
        scenarioId: w.scenario.id,
        opensAt: '2030-01-02T00:00:00Z',
        dueAt: '2030-01-01T00:00:00Z',
        attemptLimit: null,
        hintsAllowed: true,
      })
    expect(response.status).toBe(400)
    expect(response.body.error.details.fields).toHaveProperty('dueAt')
  })

  it('changes an assignment’s dates and deletes one that has no attempts yet', async () => {
    const spare = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, { title: 'Spare' })
    const patched = await supertest(api.app)
      .patch(`/api/assignments/${spare.id}`)
      .set(bearer(w.instructorA.token))
      .send({ dueAt: '2035-06-01T12:00:00.000Z', attemptLimit: 2 })
    expect(patched.status).toBe(200)
    expect(patched.body).toMatchObject({ dueAt: '2035-06-01T12:00:00.000Z', attemptLimit: 2 })
    expect(
      (await supertest(api.app).delete(`/api/assignments/${spare.id}`).set(bearer(w.instructorA.token)))
        .status,
    ).toBe(204)
    expect((await get(`/api/assignments/${spare.id}`, w.instructorA.token)).status).toBe(404)
  })

  it('archives a cohort: hidden by default, closed to new work and new invitations', async () => {
    const cohort = (
      await supertest(api.app)
        .post('/api/cohorts')
        .set(bearer(w.instructorB.token))
        .send({ name: 'Old intake' })
    ).body
    await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(w.instructorB.token))
      .send({ email: w.apprenticeB1.email, name: 'Bea Apprentice' })
    const assignment = await createAssignment(api, w.instructorB, cohort, w.scenario.id)
    const archived = await supertest(api.app)
      .patch(`/api/cohorts/${cohort.id}`)
      .set(bearer(w.instructorB.token))
      .send({ archived: true })
    expect(archived.body.archived).toBe(true)

    const visible = (await get('/api/cohorts', w.instructorB.token)).body.items.map(
      (c: { id: string }) => c.id,
    )
    expect(visible).not.toContain(cohort.id)
    const withArchived = (await get('/api/cohorts?includeArchived=true', w.instructorB.token)).body.items.map(
      (c: { id: string }) => c.id,
    )
    expect(withArchived).toContain(cohort.id)

    const attempt = await submit(api, w.apprenticeB1, { assignmentId: assignment.id })
    expect(attempt.status).toBe(409)
    expect(attempt.body.error.code).toBe('cohort_archived')
    const invite = await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(w.instructorB.token))
      .send({ email: 'late@slipway.test', name: 'Late Comer' })
    expect(invite.status).toBe(409)
  })

  it('removes a member from a cohort', async () => {
    const cohort = (
      await supertest(api.app)
        .post('/api/cohorts')
        .set(bearer(w.instructorA.token))
        .send({ name: 'Short course' })
    ).body
    await supertest(api.app)
      .post(`/api/cohorts/${cohort.id}/invitations`)
      .set(bearer(w.instructorA.token))
      .send({ email: w.apprenticeA2.email, name: 'Abel Apprentice' })
    const removed = await supertest(api.app)
      .delete(`/api/cohorts/${cohort.id}/members/${w.apprenticeA2.user.id}`)
      .set(bearer(w.instructorA.token))
    expect(removed.status).toBe(204)
    expect((await get(`/api/cohorts/${cohort.id}`, w.apprenticeA2.token)).status).toBe(403)
  })
})
