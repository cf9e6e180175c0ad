// A gradebook that tells the truth: late, missed and not-yet-due work told apart; an average over
// everything graded or past due (missed work counts 0); work due before an apprentice enrolled is not
// overdue for them; a late penalty; closing at the due date; overrides marked with their reason and not
// counted as the apprentice's activity; the CSV in the screen's words, on the centre's clock.
import { parse } from 'csv-parse/sync'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { gradebookSchema, type Assignment, type Cohort, type GradebookRow } from '../../shared/api'
import { EnrollmentEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { createAssignment, createCohort, expectStatus, submit } from '../support/world'

const days = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString()

describe('the gradebook tells the truth', () => {
  let api: TestApi
  let admin: TestUser
  let instructor: TestUser
  let pia: TestUser // passes the past-due job late
  let quinn: TestUser // does nothing
  let sol: TestUser // joins after the past-due job was due
  let cohort: Cohort
  let pastDue: Assignment
  let closed: Assignment
  let future: Assignment
  let scenarioId: string
  const reason = 'Proved dead correctly at the bench; the log missed it'

  beforeAll(async () => {
    api = await createTestApi()
    admin = await api.createUser('admin')
    instructor = await api.createUser('instructor')
    pia = await api.createUser('apprentice', { name: 'Pia Lateworth' })
    quinn = await api.createUser('apprentice', { name: 'Quinn Absent' })
    cohort = await createCohort(api, instructor, 'Truthful cohort', [pia, quinn])
    // Pia and Quinn joined at the start of term, before any of this work fell due.
    await api.dataSource
      .getRepository(EnrollmentEntity)
      .update({ cohortId: cohort.id }, { createdAt: days(-30) })
    const scenarios = (await supertest(api.app).get('/api/scenarios').set(bearer(instructor.token))).body
      .items
    scenarioId = scenarios.find((s: { key: string }) => s.key === 'two-wire-run-stop').id
    pastDue = await createAssignment(api, instructor, cohort, scenarioId, {
      title: 'Past job',
      opensAt: days(-10),
      dueAt: days(-1),
      latePolicy: 'acceptLate',
      latePenalty: 10,
    } as never)
    closed = await createAssignment(api, instructor, cohort, scenarioId, {
      title: 'Closed job',
      opensAt: days(-10),
      dueAt: days(-2),
      latePolicy: 'closeAtDue',
    } as never)
    future = await createAssignment(api, instructor, cohort, scenarioId, {
      title: 'Future job',
      opensAt: days(-1),
      dueAt: days(7),
    })
    sol = await api.createUser('apprentice', { name: 'Sol Newcomer' })
    await expectStatus(
      supertest(api.app)
        .post(`/api/cohorts/${cohort.id}/invitations`)
        .set(bearer(instructor.token))
        .send({ email: sol.email, name: sol.user.name }),
      201,
    )
  })
  afterAll(() => api.close())

  const book = async () =>
    gradebookSchema.parse(
      (
        await expectStatus(
          supertest(api.app)
            .get(`/api/cohorts/${cohort.id}/gradebook?pageSize=100`)
            .set(bearer(instructor.token)),
          200,
        )
      ).body,
    )
  const row = (b: { rows: GradebookRow[] }, who: TestUser) => b.rows.find((r) => r.userId === who.user.id)!

  it('refuses work after the due date when the assignment closes at it', async () => {
    const response = await submit(api, pia, { assignmentId: closed.id })
    expect(response.status).toBe(409)
    expect(response.body.error.code).toBe('assignment_closed')
    expect(response.body.error.message).toMatch(/closed on .*ask your instructor for an extension/)
  })

  it('accepts late work where the assignment allows it, marks it late and takes the penalty off', async () => {
    const attempt = await expectStatus(submit(api, pia, { assignmentId: pastDue.id }), 201)
    expect(attempt.body.late).toBe(true)
    await expectStatus(
      supertest(api.app)
        .post(`/api/attempts/${attempt.body.id}/grade-override`)
        .set(bearer(instructor.token))
        .send({ score: 80, passed: true, reason }),
      200,
    )
    const b = await book()
    const cell = row(b, pia).cells[b.assignments.findIndex((a) => a.id === pastDue.id)]!
    expect(cell).toMatchObject({ status: 'late', bestScore: 70, attempts: 1, overrideReason: reason })
  })

  it('calls work with nothing passing after its due date missed, and counts it 0 in the average', async () => {
    const b = await book()
    expect(b.assignments.map((a) => a.title)).toEqual(['Closed job', 'Past job', 'Future job'])
    const q = row(b, quinn)
    expect(q.cells.map((c) => c.status)).toEqual(['missed', 'missed', 'notStarted'])
    expect(q.average).toBe(0)
    expect(q.completion).toEqual({ passed: 0, assigned: 3 })
    // Pia: closed job missed (0), past job passed late (70); the future job is not due and not tried.
    const p = row(b, pia)
    expect(p.cells.map((c) => c.status)).toEqual(['missed', 'late', 'notStarted'])
    expect(p.average).toBe(35)
    expect(p.completion).toEqual({ passed: 1, assigned: 3 })
  })

  it('does not call work due before an apprentice enrolled overdue or missed', async () => {
    const s = row(await book(), sol)
    expect(s.cells.map((c) => c.status)).toEqual(['notStarted', 'notStarted', 'notStarted'])
    expect(s.cells[0]!.dueAt).toBeNull()
    expect(s.average).toBeNull()
    // …and she may still do it, on time.
    const attempt = await expectStatus(submit(api, sol, { assignmentId: closed.id }), 201)
    expect(attempt.body.late).toBe(false)
    const mine = (await supertest(api.app).get('/api/assignments').set(bearer(sol.token))).body.items
    expect(mine.find((a: Assignment) => a.id === pastDue.id).myProgress).toMatchObject({
      status: 'notStarted',
      dueAt: null,
    })
  })

  it('shows the pass mark, the required objectives and the late rule of each assignment', async () => {
    const past = (await book()).assignments.find((a) => a.id === pastDue.id)!
    expect(past).toMatchObject({ latePolicy: 'acceptLate', latePenalty: 10, targeted: false })
    expect(past.passMark).toEqual(expect.any(Number))
    expect(past.requiredObjectives).toBeGreaterThan(0)
  })

  it('does not count an instructor’s grade change as the apprentice’s activity', async () => {
    const before = row(await book(), quinn)
    const attempt = await expectStatus(submit(api, quinn, { assignmentId: future.id }), 201)
    const afterSubmit = row(await book(), quinn).lastActivity
    expect(afterSubmit).toBe(attempt.body.updatedAt)
    expect(before.lastActivity).toBeNull()
    await expectStatus(
      supertest(api.app)
        .post(`/api/attempts/${attempt.body.id}/grade-override`)
        .set(bearer(instructor.token))
        .send({ score: 55, passed: false, reason: 'Second look' }),
      200,
    )
    const after = row(await book(), quinn)
    expect(after.lastActivity).toBe(afterSubmit)
    expect(after.cells[2]).toMatchObject({ bestScore: 55, overrideReason: 'Second look' })
    // The apprentice sees the reason with the changed grade.
    const own = await supertest(api.app).get(`/api/attempts/${attempt.body.id}`).set(bearer(quinn.token))
    expect(own.body.grade).toMatchObject({ overridden: true, overrideReason: 'Second look' })
  })

  it('exports the screen’s words, due dates on the centre’s clock, late and override columns', async () => {
    await expectStatus(
      supertest(api.app).patch('/api/centre').set(bearer(admin.token)).send({ timeZone: 'America/Chicago' }),
      200,
    )
    const response = await expectStatus(
      supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook.csv`).set(bearer(instructor.token)),
      200,
    )
    const records: string[][] = parse(response.text, { bom: true })
    const header = records[0]!
    const at = (title: string, what: string) => header.findIndex((h) => h.startsWith(`${title}: ${what}`))
    expect(header[at('Past job', 'status')]).toMatch(
      /due .* GMT-[56]; pass mark \d+; .*accepts late work, 10 points off/,
    )
    expect(header[5]).toBe('Last activity (America/Chicago)')
    const pRow = records.find((r) => r[0] === 'Pia Lateworth')!
    expect(pRow[at('Past job', 'status')]).toBe('Passed late')
    expect(pRow[at('Past job', 'score')]).toBe('70.0')
    expect(pRow[at('Past job', 'late')]).toBe('yes')
    expect(pRow[at('Past job', 'grade changed by instructor')]).toBe('yes')
    expect(pRow[at('Past job', 'reason for the change')]).toBe(reason)
    expect(pRow[at('Closed job', 'status')]).toBe('Missed')
    const solRow = records.find((r) => r[0] === 'Sol Newcomer')!
    expect(solRow[at('Past job', 'own due date')]).toBe('none (joined after it was due)')
    // No identifier reaches the file.
    expect(response.text).not.toMatch(/notStarted|inProgress|acceptLate|closeAtDue|\bmissed\b(?!.)/)
  })

  it('names the filter in the file name of a filtered export, and exports everyone without one', async () => {
    const all = await expectStatus(
      supertest(api.app).get(`/api/cohorts/${cohort.id}/gradebook.csv`).set(bearer(instructor.token)),
      200,
    )
    expect(all.headers['content-disposition']).toMatch(
      /filename="gradebook-Truthful-cohort-\d{4}-\d{2}-\d{2}\.csv"/,
    )
    expect(parse(all.text, { bom: true })).toHaveLength(4)
    const filtered = await expectStatus(
      supertest(api.app)
        .get(`/api/cohorts/${cohort.id}/gradebook.csv?status=missed&assignmentId=${closed.id}&q=quinn`)
        .set(bearer(instructor.token)),
      200,
    )
    expect(filtered.headers['content-disposition']).toMatch(
      /filename="gradebook-Truthful-cohort-missed-in-closed-job-matching-quinn-\d{4}-\d{2}-\d{2}\.csv"/,
    )
    expect(
      parse(filtered.text, { bom: true })
        .map((r: string[]) => r[0])
        .slice(1),
    ).toEqual(['Quinn Absent'])
  })

  it('sorts by one assignment’s scores and by completion', async () => {
    const res = await expectStatus(
      supertest(api.app)
        .get(`/api/cohorts/${cohort.id}/gradebook?sort=${pastDue.id}&order=desc`)
        .set(bearer(instructor.token)),
      200,
    )
    const rows = gradebookSchema.parse(res.body).rows
    expect(rows.map((r) => r.name)).toEqual(['Pia Lateworth', 'Quinn Absent', 'Sol Newcomer'])
    const byCompletion = gradebookSchema.parse(
      (
        await supertest(api.app)
          .get(`/api/cohorts/${cohort.id}/gradebook?sort=completion&order=desc`)
          .set(bearer(instructor.token))
      ).body,
    ).rows
    expect(byCompletion[0]!.name).toBe('Pia Lateworth')
  })
})
