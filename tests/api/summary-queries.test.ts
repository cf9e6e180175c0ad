// Summary routes read summary columns: the gradebook, the assignment list and the attempt list never pull
// an attempt's event log, and the gradebook asks the database a fixed number of questions however many
// apprentices a cohort has (no query per row). The SQL is observed through TypeORM's logger, which every
// query runner calls whether or not logging is switched on.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { attemptPageSchema, gradebookSchema } from '../../shared/api'
import { standingsByAssignmentAndUser } from '../../server/gradebook/standings'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, createAssignment, createCohort, submit, type World } from '../support/world'

describe('summary queries', () => {
  let api: TestApi
  let world: World

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    // A second apprentice's attempt on the same assignment, so per-apprentice filtering has work to do.
    await submit(api, world.apprenticeA2, { assignmentId: world.assignmentA.id })
    await submit(api, world.apprenticeA2, { assignmentId: world.assignmentA.id, status: 'inProgress' })
  })
  afterAll(() => api.close())

  /** The SQL the data source runs while `work` runs. */
  async function sqlDuring(work: () => Promise<unknown>): Promise<string[]> {
    const spy = vi.spyOn(api.dataSource.logger, 'logQuery')
    try {
      await work()
      return spy.mock.calls.map(([query]) => query)
    } finally {
      spy.mockRestore()
    }
  }
  const touchingAttempts = (sql: string[]) => sql.filter((q) => /FROM\s+"attempts"/i.test(q))
  const readsEventLog = (q: string) => /"events"/.test(q)

  it('builds the gradebook without reading any attempt event log', async () => {
    const sql = await sqlDuring(async () => {
      const res = await supertest(api.app)
        .get(`/api/cohorts/${world.cohortA.id}/gradebook`)
        .set(bearer(world.instructorA.token))
      expect(res.status).toBe(200)
      expect(gradebookSchema.parse(res.body).rows).toHaveLength(2)
    })
    expect(touchingAttempts(sql)).toHaveLength(1)
    expect(sql.filter(readsEventLog)).toEqual([])
  })

  it('asks the same number of questions for a cohort of ten as for a cohort of two (no query per row)', async () => {
    // Reads of the gradebook's tables only: the shared rate-limit store and the mail queue keep their own time.
    const count = async (cohortId: string) =>
      (
        await sqlDuring(() =>
          supertest(api.app).get(`/api/cohorts/${cohortId}/gradebook`).set(bearer(world.instructorA.token)),
        )
      ).filter((q) => /^\s*SELECT[\s\S]*FROM\s+"(attempts|enrollments|users|assignments|cohorts)"/i.test(q))
        .length
    // Two cohorts of their own, each read once, so both reads build the gradebook (none is cached yet).
    const cohortOf = async (name: string, size: number) => {
      const people = await Promise.all(Array.from({ length: size }, () => api.createUser('apprentice')))
      const cohort = await createCohort(api, world.instructorA, name, people)
      const job = await createAssignment(api, world.instructorA, cohort, world.scenario.id)
      for (const apprentice of people) await submit(api, apprentice, { assignmentId: job.id })
      return cohort
    }
    const large = await cohortOf('Ten apprentices', 10)
    const small = await count((await cohortOf('Two apprentices', 2)).id)
    expect(small).toBeGreaterThanOrEqual(4) // assignments, enrolments, users, attempts (plus the cohort)
    expect(await count(large.id)).toBe(small)
  })

  it('lists attempts with their grades but without their event logs', async () => {
    const sql = await sqlDuring(async () => {
      const res = await supertest(api.app)
        .get(`/api/attempts?assignmentId=${world.assignmentA.id}`)
        .set(bearer(world.instructorA.token))
      expect(res.status).toBe(200)
      const list = attemptPageSchema.parse(res.body)
      expect(list.total).toBe(3)
      expect(list.items.find((a) => a.id === world.attemptA1.id)?.grade).not.toBeNull()
    })
    expect(touchingAttempts(sql).length).toBeGreaterThan(0)
    expect(sql.filter(readsEventLog)).toEqual([])
  })

  it("reads only the viewer's own attempts for an apprentice's assignment list", async () => {
    const sql = await sqlDuring(async () => {
      const res = await supertest(api.app).get('/api/assignments').set(bearer(world.apprenticeA1.token))
      expect(res.status).toBe(200)
      const mine = res.body.items.find((a: { id: string }) => a.id === world.assignmentA.id)
      expect(mine.myProgress.attemptsUsed).toBe(1)
    })
    const attemptQueries = touchingAttempts(sql)
    expect(attemptQueries).toHaveLength(1)
    expect(attemptQueries[0]).toMatch(/"userId"\s*=/)
    expect(attemptQueries.filter(readsEventLog)).toEqual([])
  })

  it('sums each apprentice up in the database: graded count, best score, pass, last activity, draft', async () => {
    const standings = await standingsByAssignmentAndUser(api.dataSource, [world.assignmentA.id])
    expect([...standings.keys()].sort()).toEqual(
      [
        `${world.assignmentA.id}:${world.apprenticeA1.user.id}`,
        `${world.assignmentA.id}:${world.apprenticeA2.user.id}`,
      ].sort(),
    )
    const a1 = standings.get(`${world.assignmentA.id}:${world.apprenticeA1.user.id}`)!
    expect(a1).toEqual({
      attempts: 1,
      bestScore: world.attemptA1.grade!.score,
      passed: world.attemptA1.grade!.passed,
      lastActivity: world.attemptA1.updatedAt,
      inProgressAttemptId: null,
      status: world.attemptA1.grade!.passed ? 'passed' : 'failed',
    })
    const a2 = standings.get(`${world.assignmentA.id}:${world.apprenticeA2.user.id}`)!
    expect(a2.attempts).toBe(1)
    expect(typeof a2.bestScore).toBe('number')
    expect(typeof a2.passed).toBe('boolean')
    expect(a2.inProgressAttemptId).toEqual(expect.any(String))
  })

  it('counts a draft as in progress, not as a graded attempt', async () => {
    const someone = await api.createUser('apprentice')
    const cohort = await createCohort(api, world.instructorA, 'Draft cohort', [someone])
    const job = await createAssignment(api, world.instructorA, cohort, world.scenario.id)
    const draft = await submit(api, someone, { assignmentId: job.id, status: 'inProgress' })
    const standings = await standingsByAssignmentAndUser(api.dataSource, [job.id])
    expect(standings.get(`${job.id}:${someone.user.id}`)).toMatchObject({
      attempts: 0,
      bestScore: null,
      passed: false,
      inProgressAttemptId: draft.body.id,
      status: 'inProgress',
    })
  })

  it('sums up one apprentice only when asked for one', async () => {
    const standings = await standingsByAssignmentAndUser(
      api.dataSource,
      [world.assignmentA.id, world.assignmentB.id],
      world.apprenticeA2.user.id,
    )
    expect([...standings.keys()]).toEqual([`${world.assignmentA.id}:${world.apprenticeA2.user.id}`])
    expect(standings.get(`${world.assignmentA.id}:${world.apprenticeA2.user.id}`)!.status).not.toBe(
      'notStarted',
    )
  })
})
