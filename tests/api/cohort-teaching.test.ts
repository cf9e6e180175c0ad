// Co-instructors and copying a cohort for its next intake: a co-instructor manages the cohort as its owner
// does but cannot choose who else teaches it; a copy carries the assignments (dates moved by whole days)
// and practice choices, not the members.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Assignment, CohortInstructor, CopyCohortResult } from '../../shared/api'
import { AuditEntryEntity, CohortEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { buildWorld, expectStatus, submit, type World } from '../support/world'

const DAY_MS = 86_400_000

describe('co-instructors and copying a cohort', () => {
  let api: TestApi
  let w: World
  let colleague: TestUser

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    colleague = await api.createUser('instructor', { name: 'Cato Colleague' })
  })
  afterAll(() => api.close())

  const as = (who: TestUser) => ({
    get: (path: string) => supertest(api.app).get(path).set(bearer(who.token)),
    post: (path: string, body: object) => supertest(api.app).post(path).set(bearer(who.token)).send(body),
    delete: (path: string) => supertest(api.app).delete(path).set(bearer(who.token)),
  })
  const instructorsPath = () => `/api/cohorts/${w.cohortA.id}/instructors`

  it('lets the owner add a colleague, who then manages the cohort but cannot add anyone', async () => {
    await expectStatus(as(colleague).get(`/api/cohorts/${w.cohortA.id}/gradebook`), 403)
    const added = await expectStatus(
      as(w.instructorA).post(instructorsPath(), { email: colleague.email }),
      201,
    )
    expect(added.body).toMatchObject({ name: 'Cato Colleague', owner: false })

    const list = await expectStatus(as(colleague).get(instructorsPath()), 200)
    expect(list.body.items.map((i: CohortInstructor) => [i.name, i.owner])).toEqual([
      ['Ines Instructor-A', true],
      ['Cato Colleague', false],
    ])
    const cohorts = await expectStatus(as(colleague).get('/api/cohorts'), 200)
    expect(cohorts.body.items.map((c: { name: string }) => c.name)).toEqual(['Cohort A'])
    await expectStatus(as(colleague).get(`/api/cohorts/${w.cohortA.id}/gradebook`), 200)
    await expectStatus(as(colleague).get(`/api/cohorts/${w.cohortA.id}/members`), 200)
    await expectStatus(as(colleague).get(`/api/attempts/${w.attemptA1.id}`), 200)
    // …but not cohort B, and not the choice of who else teaches A.
    await expectStatus(as(colleague).get(`/api/cohorts/${w.cohortB.id}/gradebook`), 403)
    const refused = await expectStatus(
      as(colleague).post(instructorsPath(), { email: w.instructorB.email }),
      403,
    )
    expect(refused.body.error.message).toMatch(/own instructor or an admin/)

    const audit = await api.dataSource
      .getRepository(AuditEntryEntity)
      .findBy({ action: 'cohort.coInstructorAdded', entityId: w.cohortA.id })
    expect(audit).toHaveLength(1)
  })

  it('says plainly why an address cannot be added', async () => {
    const post = (email: string) => as(w.instructorA).post(instructorsPath(), { email })
    const unknown = await expectStatus(post('nobody@kestrel-vale.example'), 400)
    expect(unknown.body.error.details.fields.email).toEqual(['No active instructor account has this address'])
    await expectStatus(post(w.apprenticeA1.email), 400)
    const notEmail = await expectStatus(post('not an address'), 400)
    expect(notEmail.body.error.details.fields.email).toBeDefined()
    const again = await expectStatus(post(colleague.email.toUpperCase()), 409)
    expect(again.body.error.message).toBe('Cato Colleague already teaches this cohort')
    await expectStatus(post(w.instructorA.email), 409)
    const owner = await expectStatus(
      as(w.instructorA).delete(`${instructorsPath()}/${w.instructorA.user.id}`),
      409,
    )
    expect(owner.body.error.message).toMatch(/cannot be removed/)
  })

  it('copies the cohort for the next intake: assignments moved by whole days, no members', async () => {
    const later = await expectStatus(
      as(w.instructorA).post(`/api/cohorts/${w.cohortA.id}/assignments`, {
        scenarioId: w.scenario.id,
        title: 'Just for Ada',
        opensAt: new Date(Date.now() - DAY_MS).toISOString(),
        dueAt: new Date(Date.now() + 3 * DAY_MS).toISOString(),
        attemptLimit: 2,
        hintsAllowed: false,
        apprenticeIds: [w.apprenticeA1.user.id],
      }),
      201,
    )
    expect((later.body as Assignment).targeted).toBe(true)
    await api.dataSource
      .getRepository(CohortEntity)
      .update({ id: w.cohortA.id }, { practiceKeys: JSON.stringify(['safe-isolation']) })

    // The co-instructor copies it: the copy is theirs, and the owner of the original teaches it with them.
    const copied = await expectStatus(
      as(colleague).post(`/api/cohorts/${w.cohortA.id}/copy`, {
        name: 'Cohort A, spring intake',
        shiftDays: 182,
      }),
      201,
    )
    const result = copied.body as CopyCohortResult
    expect(result).toMatchObject({ assignmentsCopied: 1, assignmentsLeftOut: 1 })
    expect(result.cohort).toMatchObject({
      name: 'Cohort A, spring intake',
      memberCount: 0,
      ownerName: 'Cato Colleague',
    })

    const assignments = (
      await expectStatus(as(colleague).get(`/api/assignments?cohortId=${result.cohort.id}`), 200)
    ).body.items as Assignment[]
    expect(assignments).toHaveLength(1)
    const [copy] = assignments
    expect(copy).toMatchObject({
      title: w.assignmentA.title,
      scenarioId: w.assignmentA.scenarioId,
      attemptLimit: w.assignmentA.attemptLimit,
      hintsAllowed: w.assignmentA.hintsAllowed,
    })
    expect(Date.parse(copy!.opensAt) - Date.parse(w.assignmentA.opensAt)).toBe(182 * DAY_MS)
    expect(Date.parse(copy!.dueAt) - Date.parse(w.assignmentA.dueAt)).toBe(182 * DAY_MS)

    const teachers = (
      await expectStatus(as(w.instructorA).get(`/api/cohorts/${result.cohort.id}/instructors`), 200)
    ).body.items as CohortInstructor[]
    expect(teachers.map((t) => [t.name, t.owner])).toEqual([
      ['Cato Colleague', true],
      ['Ines Instructor-A', false],
    ])
    const row = await api.dataSource.getRepository(CohortEntity).findOneByOrFail({ id: result.cohort.id })
    expect(JSON.parse(row.practiceKeys!)).toEqual(['safe-isolation'])
  })

  it('refuses a copy that moves dates by more than ten years or by part of a day', async () => {
    const far = await expectStatus(
      as(w.instructorA).post(`/api/cohorts/${w.cohortA.id}/copy`, { name: 'Far', shiftDays: 4000 }),
      400,
    )
    expect(far.body.error.details.fields.shiftDays).toEqual(['Dates can move at most ten years'])
    const part = await expectStatus(
      as(w.instructorA).post(`/api/cohorts/${w.cohortA.id}/copy`, { name: 'Part', shiftDays: 1.5 }),
      400,
    )
    expect(part.body.error.details.fields.shiftDays).toEqual(['Move the dates by whole days'])
    await expectStatus(
      as(w.instructorB).post(`/api/cohorts/${w.cohortA.id}/copy`, { name: 'Theirs', shiftDays: 7 }),
      403,
    )
  })

  it('lets a co-instructor leave, after which the cohort is closed to them', async () => {
    await expectStatus(as(colleague).delete(`${instructorsPath()}/${colleague.user.id}`), 204)
    await expectStatus(as(colleague).get(`/api/cohorts/${w.cohortA.id}/gradebook`), 403)
    await expectStatus(as(colleague).get(`/api/attempts/${w.attemptA1.id}`), 403)
    await expectStatus(as(w.instructorA).delete(`${instructorsPath()}/${colleague.user.id}`), 404)
    // A submission in the cohort still works for its apprentices meanwhile.
    await expectStatus(submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id }), 201)
  })
})
