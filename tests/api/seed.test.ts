// The demo seed: an invented centre whose accounts sign in, with cohorts, assignments and graded attempts.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { pino } from 'pino'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  ScenarioEntity,
  UserEntity,
} from '../../server/entities'
import { DEMO_ACCOUNTS, DEMO_DOMAIN, demoSignInTable } from '../../server/demo/demo-accounts'
import { isDatabaseEmpty, seedDemo } from '../../server/demo/seed'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'

describe('demo seed', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi()
    expect(await isDatabaseEmpty(api.dataSource)).toBe(true)
    await seedDemo(api.dataSource, api.passwords, pino({ level: 'silent' }))
  })
  afterAll(() => api.close())

  it('creates one admin, two instructors, two cohorts and about a dozen apprentices at an example domain', async () => {
    const users = await api.dataSource.getRepository(UserEntity).find()
    const count = (role: string) => users.filter((u) => u.role === role).length
    expect(count('admin')).toBe(1)
    expect(count('instructor')).toBe(2)
    expect(count('apprentice')).toBeGreaterThanOrEqual(10)
    expect(users.every((u) => u.email.endsWith(`@${DEMO_DOMAIN}`) && DEMO_DOMAIN.endsWith('.example'))).toBe(
      true,
    )
    expect(await api.dataSource.getRepository(CohortEntity).count()).toBe(2)
    expect(await api.dataSource.getRepository(EnrollmentEntity).count()).toBe(count('apprentice'))
  })

  it('files each sample attempt under the assignment of the scenario it was graded on', async () => {
    const attempts = await api.dataSource.getRepository(AttemptEntity).find()
    const assignments = await api.dataSource.getRepository(AssignmentEntity).find()
    const scenarios = await api.dataSource.getRepository(ScenarioEntity).find()
    const graded = attempts.filter((a) => a.evidence)
    expect(graded.length).toBeGreaterThan(3)
    for (const attempt of graded) {
      const assignment = assignments.find((a) => a.id === attempt.assignmentId)!
      const scenario = scenarios.find((s) => s.id === assignment.scenarioId)!
      expect(attempt.scenarioId).toBe(scenario.id)
      expect((JSON.parse(attempt.evidence!) as { scenarioId: string }).scenarioId).toBe(scenario.key)
      expect(assignment.title).toBe(scenario.title)
    }
  })

  it('puts every demo apprentice in the cohort of the instructor the demo accounts name', async () => {
    const rows: { apprentice: string; owner: string }[] = await api.dataSource.query(
      // Quoted: PostgreSQL folds unquoted names to lower case.
      `SELECT a.email AS apprentice, o.email AS owner FROM enrollments e JOIN users a ON a.id = e."userId"
       JOIN cohorts c ON c.id = e."cohortId" JOIN users o ON o.id = c."ownerId"`,
    )
    const ownerOf = (cohort: number | undefined) =>
      DEMO_ACCOUNTS.find((a) => a.role === 'instructor' && a.cohort === cohort)!.email
    const expected = DEMO_ACCOUNTS.filter((a) => a.role === 'apprentice').map((a) => ({
      apprentice: a.email,
      owner: ownerOf(a.cohort),
    }))
    const byEmail = (x: { apprentice: string }, y: { apprentice: string }) =>
      x.apprentice.localeCompare(y.apprentice)
    expect(rows.sort(byEmail)).toEqual(expected.sort(byEmail))
  })

  it('lets every demo account sign in with the shared demo password', async () => {
    for (const account of DEMO_ACCOUNTS) {
      await expect(api.signIn(account.email, account.password)).resolves.toHaveProperty('token')
    }
  })

  it('sets shipped scenarios as assignments and grades sample attempts with the real grader', async () => {
    expect(await api.dataSource.getRepository(AssignmentEntity).count()).toBeGreaterThanOrEqual(4)
    const attempts = await api.dataSource.getRepository(AttemptEntity).find()
    const graded = attempts.filter((a) => a.status === 'submitted')
    expect(graded.length).toBeGreaterThanOrEqual(10)
    // Reference solutions pass and mistakes do not: the grades come from replaying the fixture logs.
    expect(graded.some((a) => a.autoPassed)).toBe(true)
    expect(graded.some((a) => !a.autoPassed)).toBe(true)
    expect(attempts.some((a) => a.status === 'inProgress')).toBe(true)
  })

  it('gives the first instructor a gradebook with real rows', async () => {
    const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor')!
    const { token } = await api.signIn(instructor.email, instructor.password)
    const cohorts = (await api.http.get('/api/cohorts').set(bearer(token))).body.items
    const book = (await api.http.get(`/api/cohorts/${cohorts[0].id}/gradebook`).set(bearer(token))).body
    expect(book.assignments.length).toBeGreaterThanOrEqual(2)
    expect(
      book.rows.some((r: { cells: { status: string }[] }) => r.cells.some((c) => c.status === 'passed')),
    ).toBe(true)
  })

  it('prints a short sign-in table with the password', () => {
    const table = demoSignInTable()
    expect(table).toContain(DEMO_ACCOUNTS[0]!.email)
    expect(table).toContain(DEMO_ACCOUNTS[0]!.password)
    expect(table.split('\n').length).toBeLessThan(10)
  })
})
