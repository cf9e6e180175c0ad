// The gradebook is kept in memory between requests and must never be served stale: after every kind of
// write a gradebook shows, the answer equals one built afresh from the database, whichever app instance
// made the write; and an unchanged cohort is answered without asking the database for its attempts again.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { gradebookSchema, type Gradebook } from '../../shared/api'
import { createApp } from '../../server/app'
import { CohortEntity } from '../../server/entities'
import { loadGradebook, viewGradebook } from '../../server/gradebook/gradebook.service'
import { bearer, createTestApi, TEST_JWT_SECRET, type TestApi } from '../support/api-harness'
import { buildWorld, createAssignment, expectStatus, submit, type World } from '../support/world'

describe('gradebook cache', () => {
  let api: TestApi
  let world: World

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
  })
  afterAll(() => api.close())

  const cohortRow = () => api.dataSource.getRepository(CohortEntity).findOneByOrFail({ id: world.cohortA.id })

  async function served(app = api.app): Promise<Gradebook> {
    const res = await expectStatus(
      supertest(app)
        .get(`/api/cohorts/${world.cohortA.id}/gradebook?pageSize=100`)
        .set(bearer(world.instructorA.token)),
      200,
    )
    return gradebookSchema.parse(res.body)
  }

  /** What the route would answer with nothing cached: straight from the database. */
  async function fresh() {
    const built = await loadGradebook(api.dataSource, await cohortRow())
    return {
      assignments: built.assignments.map((a) => ({ id: a.id, title: a.title, dueAt: a.dueAt })),
      rows: viewGradebook(built, { sort: 'name', order: 'asc' }),
    }
  }

  async function attemptQueriesDuring(work: () => Promise<unknown>): Promise<number> {
    const spy = vi.spyOn(api.dataSource.logger, 'logQuery')
    try {
      await work()
      return spy.mock.calls.filter(([query]) => /FROM\s+"attempts"/i.test(query)).length
    } finally {
      spy.mockRestore()
    }
  }

  async function expectCurrent(app = api.app) {
    const answer = await served(app)
    const expected = await fresh()
    expect(answer.assignments).toEqual(expected.assignments)
    expect(answer.rows).toEqual(expected.rows)
    return answer
  }

  /** Runs a write and checks that it moved the cohort's revision and that the gradebook shows it. */
  async function afterWrite(write: () => Promise<unknown>) {
    await served() // cached before the write
    const before = (await cohortRow()).gradebookRevision!
    await write()
    expect((await cohortRow()).gradebookRevision).toBeGreaterThan(before)
    return expectCurrent()
  }

  it('answers an unchanged cohort from memory, without reading attempts again', async () => {
    await served()
    expect(await attemptQueriesDuring(() => served())).toBe(0)
    // …and nothing but a write a gradebook shows moves the revision: a sign-in updates the user row.
    const before = (await cohortRow()).gradebookRevision
    await api.signIn(world.apprenticeA1.email, world.apprenticeA1.password)
    expect((await cohortRow()).gradebookRevision).toBe(before)
    expect(await attemptQueriesDuring(() => served())).toBe(0)
  })

  it('answers 304 Not Modified to a client that already has the current page, and 200 after a change', async () => {
    const url = `/api/cohorts/${world.cohortA.id}/gradebook?pageSize=100`
    const first = await expectStatus(supertest(api.app).get(url).set(bearer(world.instructorA.token)), 200)
    const etag = first.headers.etag as string
    expect(first.headers['cache-control']).toBe('private, no-cache')
    const again = supertest(api.app).get(url).set(bearer(world.instructorA.token)).set('If-None-Match', etag)
    expect((await expectStatus(again, 304)).text).toBe('')
    await expectStatus(
      submit(api, world.apprenticeA1, { assignmentId: world.assignmentA.id, status: 'inProgress' }),
      201,
    )
    const changed = supertest(api.app)
      .get(url)
      .set(bearer(world.instructorA.token))
      .set('If-None-Match', etag)
    expect((await expectStatus(changed, 200)).headers.etag).not.toBe(etag)
  })

  it('shows a new submitted attempt', async () => {
    const book = await afterWrite(() =>
      expectStatus(submit(api, world.apprenticeA2, { assignmentId: world.assignmentA.id }), 201),
    )
    expect(book.rows.find((r) => r.userId === world.apprenticeA2.user.id)!.cells[0]!.attempts).toBe(1)
  })

  it('shows an attempt in progress', async () => {
    const book = await afterWrite(() =>
      expectStatus(
        submit(api, world.apprenticeA2, { assignmentId: world.assignmentA.id, status: 'inProgress' }),
        201,
      ),
    )
    expect(book.rows.find((r) => r.userId === world.apprenticeA2.user.id)).toBeDefined()
  })

  it('shows a grade override', async () => {
    const book = await afterWrite(() =>
      expectStatus(
        supertest(api.app)
          .post(`/api/attempts/${world.attemptA1.id}/grade-override`)
          .set(bearer(world.instructorA.token))
          .send({ score: 97, passed: true, reason: 'Checked the wiring by hand' }),
        200,
      ),
    )
    const cell = book.rows.find((r) => r.userId === world.apprenticeA1.user.id)!.cells[0]!
    expect(cell.bestScore).toBe(97)
    expect(cell.status).toBe('passed')
  })

  it('shows an apprentice’s new name', async () => {
    const book = await afterWrite(() =>
      expectStatus(
        supertest(api.app)
          .patch('/api/auth/me')
          .set(bearer(world.apprenticeA1.token))
          .send({ name: 'Ada Renamed-Apprentice' }),
        200,
      ),
    )
    expect(book.rows.map((r) => r.name)).toContain('Ada Renamed-Apprentice')
  })

  it('shows a new, a retitled and a deleted assignment', async () => {
    const extra = await createAssignment(api, world.instructorA, world.cohortA, world.scenario.id, {
      title: 'Extra practice',
    })
    await expectCurrent()
    let book = await afterWrite(() =>
      expectStatus(
        supertest(api.app)
          .patch(`/api/assignments/${extra.id}`)
          .set(bearer(world.instructorA.token))
          .send({ title: 'Extra practice, retitled' }),
        200,
      ),
    )
    expect(book.assignments.map((a) => a.title)).toContain('Extra practice, retitled')
    book = await afterWrite(() =>
      expectStatus(
        supertest(api.app).delete(`/api/assignments/${extra.id}`).set(bearer(world.instructorA.token)),
        204,
      ),
    )
    expect(book.assignments.map((a) => a.id)).not.toContain(extra.id)
  })

  it('shows a member added and a member removed', async () => {
    const newcomer = await api.createUser('apprentice', { name: 'Nia Newcomer' })
    let book = await afterWrite(() =>
      expectStatus(
        supertest(api.app)
          .post(`/api/cohorts/${world.cohortA.id}/invitations`)
          .set(bearer(world.instructorA.token))
          .send({ email: newcomer.email, name: newcomer.user.name }),
        201,
      ),
    )
    expect(book.rows.map((r) => r.userId)).toContain(newcomer.user.id)
    book = await afterWrite(() =>
      expectStatus(
        supertest(api.app)
          .delete(`/api/cohorts/${world.cohortA.id}/members/${newcomer.user.id}`)
          .set(bearer(world.instructorA.token)),
        204,
      ),
    )
    expect(book.rows.map((r) => r.userId)).not.toContain(newcomer.user.id)
  })

  it('never serves one instance’s cached gradebook after another instance wrote to the database', async () => {
    // A second app on the same database, as a second server process behind a load balancer would be.
    const other = createApp({
      dataSource: api.dataSource,
      config: api.config,
      jwtSecret: TEST_JWT_SECRET,
      passwords: api.passwords,
    })
    await served(other)
    await expectStatus(submit(api, world.apprenticeA1, { assignmentId: world.assignmentA.id }), 201)
    const book = await expectCurrent(other)
    expect(book.rows.find((r) => r.userId === world.apprenticeA1.user.id)!.cells[0]!.attempts).toBe(2)
  })
})
