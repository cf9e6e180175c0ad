// Exceptions for one apprentice on one assignment: their own due date, extra attempts, excused — each
// with a reason; the assignment page's list of apprentices under their own terms.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  assignmentApprenticeListSchema,
  gradebookSchema,
  type Assignment,
  type AssignmentApprentice,
  type Cohort,
} from '../../shared/api'
import { AttemptEntity, EnrollmentEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createCohort, expectStatus, submit } from '../support/world'

const days = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString()
const REASON = 'Off sick with a doctor’s note for the week it was due'

describe('exceptions for one apprentice', () => {
  let api: TestApi
  let instructor: TestUser
  let ada: TestUser
  let abel: TestUser
  let outsider: TestUser
  let cohort: Cohort
  let closed: Assignment

  beforeAll(async () => {
    api = await createTestApi()
    instructor = await api.createUser('instructor')
    const otherInstructor = await api.createUser('instructor')
    ada = await api.createUser('apprentice', { name: 'Ada Apprentice' })
    abel = await api.createUser('apprentice', { name: 'Abel Apprentice' })
    outsider = await api.createUser('apprentice', { name: 'Otto Outsider' })
    cohort = await createCohort(api, instructor, 'Exceptional cohort', [ada, abel])
    await createCohort(api, otherInstructor, 'Other cohort', [outsider])
    // Both joined at the start of term, before this work fell due.
    await api.dataSource
      .getRepository(EnrollmentEntity)
      .update({ cohortId: cohort.id }, { createdAt: days(-30) })
    const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(instructor.token))).body
    const scenarioId = scenarios.items.find((s: { key: string }) => s.key === 'two-wire-run-stop').id
    closed = (
      await expectStatus(
        supertest(api.app)
          .post(`/api/cohorts/${cohort.id}/assignments`)
          .set(bearer(instructor.token))
          .send({
            scenarioId,
            opensAt: days(-10),
            dueAt: days(-2),
            attemptLimit: 1,
            hintsAllowed: true,
            latePolicy: 'closeAtDue',
          }),
        201,
      )
    ).body
  })
  afterAll(() => api.close())

  const list = async (): Promise<AssignmentApprentice[]> =>
    assignmentApprenticeListSchema.parse(
      (
        await expectStatus(
          supertest(api.app).get(`/api/assignments/${closed.id}/apprentices`).set(bearer(instructor.token)),
          200,
        )
      ).body,
    ).items
  const row = async (who: TestUser) => (await list()).find((r) => r.userId === who.user.id)!
  const except = (body: object) =>
    supertest(api.app)
      .post(`/api/assignments/${closed.id}/exceptions`)
      .set(bearer(instructor.token))
      .send(body)

  it('lists the cohort by name under the assignment’s terms before any exception', async () => {
    const rows = await list()
    expect(rows.map((r) => r.name)).toEqual(['Abel Apprentice', 'Ada Apprentice'])
    for (const r of rows) {
      expect(r).toMatchObject({ status: 'missed', dueAt: closed.dueAt, extended: false, attemptLimit: 1 })
      expect(r).toMatchObject({ excused: false, extraAttempts: 0, reason: '', assigned: true })
    }
  })

  it('gives one apprentice her own due date: she may submit, on time, while the rest stay closed', async () => {
    const ownDue = days(3)
    const r = await expectStatus(except({ userIds: [ada.user.id], dueAt: ownDue, reason: REASON }), 200)
    const mine = r.body.items.find((i: AssignmentApprentice) => i.userId === ada.user.id)
    expect(mine).toMatchObject({ status: 'notStarted', dueAt: ownDue, extended: true, reason: REASON })
    expect(await row(abel)).toMatchObject({ status: 'missed', extended: false })

    const attempt = await expectStatus(submit(api, ada, { assignmentId: closed.id }), 201)
    const stored = await api.dataSource.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.body.id })
    expect(Boolean(stored.late)).toBe(false)
    const refused = await expectStatus(submit(api, abel, { assignmentId: closed.id }), 409)
    expect(refused.body.error.code).toBe('assignment_closed')

    // Her own date moved back before her submission: the attempt she made is now late.
    await expectStatus(except({ userIds: [ada.user.id], dueAt: days(-1), reason: REASON }), 200)
    const again = await api.dataSource.getRepository(AttemptEntity).findOneByOrFail({ id: attempt.body.id })
    expect(Boolean(again.late)).toBe(true)
  })

  it('allows extra attempts above the assignment’s limit', async () => {
    await expectStatus(except({ userIds: [ada.user.id], dueAt: days(3), reason: REASON }), 200)
    expect(await row(ada)).toMatchObject({ attempts: 1, attemptLimit: 1 })
    const spent = await expectStatus(submit(api, ada, { assignmentId: closed.id }), 409)
    expect(spent.body.error.code).toBe('attempt_limit_reached')

    await expectStatus(
      except({ userIds: [ada.user.id], extraAttempts: 2, reason: 'A fault on the bench PC' }),
      200,
    )
    // The due date she had is kept: fields left out keep what each already has.
    expect(await row(ada)).toMatchObject({ attemptLimit: 3, extraAttempts: 2, extended: true })
    expect((await row(ada)).reason).toBe('A fault on the bench PC')
    await expectStatus(submit(api, ada, { assignmentId: closed.id }), 201)
  })

  it('excuses an apprentice: no longer missed, and out of their average', async () => {
    const abelInGradebook = async () =>
      gradebookSchema
        .parse(
          (
            await expectStatus(
              supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook`).set(bearer(instructor.token)),
              200,
            )
          ).body,
        )
        .rows.find((r) => r.userId === abel.user.id)!
    // Missed, it counts 0 in his average.
    expect(await abelInGradebook()).toMatchObject({ average: 0, completion: { passed: 0, assigned: 1 } })
    await expectStatus(except({ userIds: [abel.user.id], excused: true, reason: REASON }), 200)
    expect(await row(abel)).toMatchObject({ status: 'excused', excused: true, reason: REASON })
    const excused = await abelInGradebook()
    expect(excused.cells[0]!.status).toBe('excused')
    expect(excused).toMatchObject({ average: null, completion: { passed: 0, assigned: 0 } })
  })

  it('refuses the lot when one chosen is not a member, and says why', async () => {
    const before = await list()
    const r = await expectStatus(
      except({ userIds: [ada.user.id, outsider.user.id], extraAttempts: 9, reason: REASON }),
      400,
    )
    expect(r.body.error.details.fields.userIds[0]).toMatch(/1 of those chosen are not members/)
    expect(await list()).toEqual(before)
  })

  it('asks for a reason, something to change, and a due date after the assignment opens', async () => {
    const noReason = await expectStatus(except({ userIds: [ada.user.id], excused: true, reason: ' ' }), 400)
    expect(noReason.body.error.details.fields.reason[0]).toMatch(/Say why/)
    await expectStatus(except({ userIds: [ada.user.id], reason: REASON }), 400)
    await expectStatus(except({ userIds: [], excused: true, reason: REASON }), 400)
    const early = await expectStatus(
      except({ userIds: [ada.user.id], dueAt: days(-20), reason: REASON }),
      400,
    )
    expect(early.body.error.details.fields.dueAt[0]).toMatch(/after the assignment opens/)
  })

  it('puts an apprentice back on the assignment’s terms, once', async () => {
    const clear = () =>
      supertest(api.app)
        .delete(`/api/assignments/${closed.id}/exceptions/${abel.user.id}`)
        .set(bearer(instructor.token))
    await expectStatus(clear(), 204)
    expect(await row(abel)).toMatchObject({ status: 'missed', excused: false, reason: '' })
    await expectStatus(clear(), 404)
  })

  it('keeps no row for an exception that changes nothing', async () => {
    await expectStatus(
      except({
        userIds: [ada.user.id],
        dueAt: null,
        extraAttempts: 0,
        excused: false,
        reason: 'Back to normal',
      }),
      200,
    )
    expect(await row(ada)).toMatchObject({
      extended: false,
      extraAttempts: 0,
      reason: '',
      dueAt: closed.dueAt,
    })
  })
})
