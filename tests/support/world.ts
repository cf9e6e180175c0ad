// A small training centre built through the API, for tests that need people, cohorts and work:
// two instructors with a cohort each, apprentices in each, an assignment per cohort and an attempt.
import { randomUUID } from 'node:crypto'
import supertest from 'supertest'
import type { Assignment, AttemptSummary, Cohort, ScenarioSummary } from '../../shared/api'
import type { AssistanceLevel } from '../../shared/scenario/assistance'
import { bearer, type TestApi, type TestUser } from './api-harness'

export interface World {
  admin: TestUser
  instructorA: TestUser
  instructorB: TestUser
  apprenticeA1: TestUser
  apprenticeA2: TestUser
  apprenticeB1: TestUser
  cohortA: Cohort
  cohortB: Cohort
  scenario: ScenarioSummary
  assignmentA: Assignment
  assignmentB: Assignment
  /** A submitted attempt by apprenticeA1 on assignmentA. */
  attemptA1: AttemptSummary
}

/** A minimal log every scenario can replay: nothing done, then the end marker. */
export const EMPTY_LOG = [{ t: 1000, type: 'attempt.ended' as const }]

export async function expectStatus(
  response: supertest.Response | Promise<supertest.Response>,
  status: number,
) {
  const r = await response
  if (r.status !== status) throw new Error(`expected ${status}, got ${r.status}: ${r.text}`)
  return r
}

export async function createCohort(
  api: TestApi,
  owner: TestUser,
  name: string,
  members: TestUser[],
): Promise<Cohort> {
  const cohort = (
    await expectStatus(supertest(api.app).post('/api/cohorts').set(bearer(owner.token)).send({ name }), 201)
  ).body as Cohort
  for (const member of members) {
    await expectStatus(
      supertest(api.app)
        .post(`/api/cohorts/${cohort.id}/invitations`)
        .set(bearer(owner.token))
        .send({ email: member.email, name: member.user.name }),
      201,
    )
  }
  return cohort
}

export async function createAssignment(
  api: TestApi,
  owner: TestUser,
  cohort: Cohort,
  scenarioId: string,
  fields: Partial<{
    opensAt: string
    dueAt: string
    attemptLimit: number | null
    hintsAllowed: boolean
    assistanceLevel: AssistanceLevel
    title: string
  }> = {},
): Promise<Assignment> {
  const body = {
    scenarioId,
    opensAt: new Date(Date.now() - 86_400_000).toISOString(),
    dueAt: new Date(Date.now() + 7 * 86_400_000).toISOString(),
    attemptLimit: null,
    ...fields,
  }
  return (
    await expectStatus(
      supertest(api.app).post(`/api/cohorts/${cohort.id}/assignments`).set(bearer(owner.token)).send(body),
      201,
    )
  ).body as Assignment
}

export async function submit(
  api: TestApi,
  who: TestUser,
  body: {
    assignmentId?: string
    scenarioId?: string
    status?: 'inProgress' | 'submitted'
    events?: unknown[]
    id?: string
    assistanceLevel?: string
  },
) {
  return supertest(api.app)
    .post('/api/attempts')
    .set(bearer(who.token))
    .send({ id: randomUUID(), status: 'submitted', events: EMPTY_LOG, ...body })
}

export async function buildWorld(api: TestApi, scenarioKey = 'two-wire-run-stop'): Promise<World> {
  const admin = await api.createUser('admin', { name: 'Aldous Admin' })
  const instructorA = await api.createUser('instructor', { name: 'Ines Instructor-A' })
  const instructorB = await api.createUser('instructor', { name: 'Bram Instructor-B' })
  const apprenticeA1 = await api.createUser('apprentice', { name: 'Ada Apprentice' })
  const apprenticeA2 = await api.createUser('apprentice', { name: 'Abel Apprentice' })
  const apprenticeB1 = await api.createUser('apprentice', { name: 'Bea Apprentice' })
  const cohortA = await createCohort(api, instructorA, 'Cohort A', [apprenticeA1, apprenticeA2])
  const cohortB = await createCohort(api, instructorB, 'Cohort B', [apprenticeB1])
  const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(admin.token))).body
    .items as ScenarioSummary[]
  const scenario = scenarios.find((s) => s.key === scenarioKey)!
  const assignmentA = await createAssignment(api, instructorA, cohortA, scenario.id)
  const assignmentB = await createAssignment(api, instructorB, cohortB, scenario.id)
  const attemptA1 = (await expectStatus(submit(api, apprenticeA1, { assignmentId: assignmentA.id }), 201))
    .body as AttemptSummary
  return {
    admin,
    instructorA,
    instructorB,
    apprenticeA1,
    apprenticeA2,
    apprenticeB1,
    cohortA,
    cohortB,
    scenario,
    assignmentA,
    assignmentB,
    attemptA1,
  }
}
