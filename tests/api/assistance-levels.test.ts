// Assistance levels (issue 15): an assignment carries one, each attempt keeps the level it was started at,
// practice lets the apprentice choose, the grade follows the level and an assessment refuses hints.
import { randomUUID } from 'node:crypto'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { assignmentSchema, attemptSummarySchema } from '../../shared/api'
import { AssignmentEntity, AttemptEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, createAssignment, EMPTY_LOG, submit, type World } from '../support/world'

// two-wire-run-stop's hint "hint-sink" costs 5 points (scenarios/two-wire-run-stop.json).
const HINT = { t: 100, type: 'hint.revealed', hintId: 'hint-sink' }
const HINT_LOG = [HINT, ...EMPTY_LOG]

describe('assistance levels', () => {
  let api: TestApi
  let w: World
  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  it('sets an assignment at standard unless the instructor chooses, and keeps hintsAllowed in step', async () => {
    expect(w.assignmentA.assistanceLevel).toBe('standard')
    expect(w.assignmentA.hintsAllowed).toBe(true)
    const guided = assignmentSchema.parse(
      await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, { assistanceLevel: 'guided' }),
    )
    expect(guided).toMatchObject({ assistanceLevel: 'guided', hintsAllowed: true })
    const assessed = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      assistanceLevel: 'assessment',
    })
    expect(assessed).toMatchObject({ assistanceLevel: 'assessment', hintsAllowed: false })
    const row = await api.dataSource.getRepository(AssignmentEntity).findOneByOrFail({ id: assessed.id })
    expect(Boolean(row.hintsAllowed)).toBe(false)
    // An older client's "no hints" is an assessment.
    const older = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      hintsAllowed: false,
    })
    expect(older.assistanceLevel).toBe('assessment')
  })

  it('changes the level when editing, and refuses an unknown level or one that disagrees with hintsAllowed', async () => {
    const url = `/api/assignments/${w.assignmentA.id}`
    const changed = await supertest(api.app)
      .patch(url)
      .set(bearer(w.instructorA.token))
      .send({ assistanceLevel: 'guided' })
    expect(changed.status).toBe(200)
    expect(changed.body).toMatchObject({ assistanceLevel: 'guided', hintsAllowed: true })
    const bad = await supertest(api.app)
      .patch(url)
      .set(bearer(w.instructorA.token))
      .send({ assistanceLevel: 'expert' })
    expect(bad.status).toBe(400)
    expect(JSON.stringify(bad.body.error)).toContain('Choose an assistance level')
    const clash = await supertest(api.app)
      .post(`/api/cohorts/${w.cohortA.id}/assignments`)
      .set(bearer(w.instructorA.token))
      .send({
        scenarioId: w.scenario.id,
        opensAt: new Date(Date.now() - 86_400_000).toISOString(),
        dueAt: new Date(Date.now() + 86_400_000).toISOString(),
        attemptLimit: null,
        assistanceLevel: 'assessment',
        hintsAllowed: true,
      })
    expect(clash.status).toBe(400)
    expect(JSON.stringify(clash.body.error)).toContain('except assessment')
    await supertest(api.app).patch(url).set(bearer(w.instructorA.token)).send({ assistanceLevel: 'standard' })
  })

  it('records the assignment’s level on the attempt when it starts, and keeps it when the level changes later', async () => {
    const assignment = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      assistanceLevel: 'guided',
    })
    const id = randomUUID()
    const started = await submit(api, w.apprenticeA1, {
      id,
      assignmentId: assignment.id,
      status: 'inProgress',
      events: [HINT],
      assistanceLevel: 'assessment', // ignored: assigned work takes the assignment's level
    })
    expect(started.status).toBe(201)
    expect(attemptSummarySchema.parse(started.body).assistanceLevel).toBe('guided')
    await supertest(api.app)
      .patch(`/api/assignments/${assignment.id}`)
      .set(bearer(w.instructorA.token))
      .send({ assistanceLevel: 'assessment' })
      .expect(200)
    // Started guided, so a hint is still allowed and free.
    const done = await submit(api, w.apprenticeA1, { id, assignmentId: assignment.id, events: HINT_LOG })
    expect(done.status).toBe(201)
    expect(done.body.assistanceLevel).toBe('guided')
    expect(done.body.grade.evidence.points.hintCost).toBe(0)
    const row = await api.dataSource.getRepository(AttemptEntity).findOneByOrFail({ id })
    expect(row.assistanceLevel).toBe('guided')
    // The commissioning record prints the stored level, in words.
    const record = await supertest(api.app)
      .get(`/api/attempts/${id}/commissioning-record`)
      .set(bearer(w.instructorA.token))
    expect(record.status).toBe(200)
    expect(record.body.attempt.assistance).toBe('Guided')
    // A new attempt starts at the level set now.
    const next = await submit(api, w.apprenticeA1, { assignmentId: assignment.id })
    expect(next.body.assistanceLevel).toBe('assessment')
  })

  it('charges a hint at standard and refuses one in an assessment, storing nothing', async () => {
    const standard = await submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id, events: HINT_LOG })
    expect(standard.status).toBe(201)
    expect(standard.body.assistanceLevel).toBe('standard')
    expect(standard.body.grade.evidence.points.hintCost).toBe(5)
    const assessed = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      assistanceLevel: 'assessment',
    })
    const id = randomUUID()
    const refused = await submit(api, w.apprenticeA2, { id, assignmentId: assessed.id, events: HINT_LOG })
    expect(refused.status).toBe(400)
    expect(refused.body.error.code).toBe('hints_not_allowed')
    expect(refused.body.error.message).toContain('assessment')
    expect(await api.dataSource.getRepository(AttemptEntity).countBy({ id })).toBe(0)
  })

  it('lets the apprentice choose the level for practice (default standard), and refuses an unknown one', async () => {
    const plain = await submit(api, w.apprenticeA1, { scenarioId: w.scenario.id })
    expect(plain.status).toBe(201)
    expect(plain.body.assistanceLevel).toBe('standard')
    const guided = await submit(api, w.apprenticeA1, {
      scenarioId: w.scenario.id,
      assistanceLevel: 'guided',
      events: HINT_LOG,
    })
    expect(guided.status).toBe(201)
    expect(guided.body).toMatchObject({ assistanceLevel: 'guided' })
    expect(guided.body.grade.evidence.points.hintCost).toBe(0)
    const assessedHint = await submit(api, w.apprenticeA1, {
      scenarioId: w.scenario.id,
      assistanceLevel: 'assessment',
      events: HINT_LOG,
    })
    expect(assessedHint.status).toBe(400)
    expect(assessedHint.body.error.code).toBe('hints_not_allowed')
    const bad = await submit(api, w.apprenticeA1, { scenarioId: w.scenario.id, assistanceLevel: 'easy' })
    expect(bad.status).toBe(400)
    expect(bad.body.error.code).toBe('validation_failed')
    expect(JSON.stringify(bad.body.error)).toContain('Choose an assistance level')
  })
})
