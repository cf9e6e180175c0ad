// The instructor's needs-attention list: attempts awaiting review (until marked reviewed or given
// feedback), safety violations this week in words, work closing within 48 hours that some have not
// submitted, work missed lately; only the caller's own cohorts, archived ones left out.
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { attentionSchema, type Attention } from '../../shared/api'
import { EnrollmentEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { attemptFixtures } from '../support/shipped-attempts'
import { buildWorld, createAssignment, expectStatus, submit, type World } from '../support/world'

const hours = (n: number) => new Date(Date.now() + n * 3_600_000).toISOString()

describe('needs attention', () => {
  let api: TestApi
  let w: World

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    await api.dataSource
      .getRepository(EnrollmentEntity)
      .update({ cohortId: w.cohortA.id }, { createdAt: hours(-24 * 20) })
  })
  afterAll(() => api.close())

  const attention = async (who: TestUser): Promise<Attention> =>
    attentionSchema.parse(
      (await expectStatus(supertest(api.app).get('/api/attention').set(bearer(who.token)), 200)).body,
    )

  it('lists submitted attempts awaiting review, only in the caller’s cohorts', async () => {
    const mine = await attention(w.instructorA)
    expect(mine.awaitingReview.items.map((a) => a.attemptId)).toContain(w.attemptA1.id)
    expect(mine.awaitingReview.items[0]).toMatchObject({
      userName: 'Ada Apprentice',
      cohortName: 'Cohort A',
      assignmentTitle: w.assignmentA.title,
    })
    const theirs = await attention(w.instructorB)
    expect(theirs.awaitingReview.items.map((a) => a.attemptId)).not.toContain(w.attemptA1.id)
  })

  it('drops an attempt once it is marked reviewed, or given feedback, and brings it back when unmarked', async () => {
    const review = (reviewed: boolean) =>
      expectStatus(
        supertest(api.app)
          .post(`/api/attempts/${w.attemptA1.id}/review`)
          .set(bearer(w.instructorA.token))
          .send({ reviewed }),
        200,
      )
    const marked = await review(true)
    expect(marked.body.reviewedAt).toEqual(expect.any(String))
    expect((await attention(w.instructorA)).awaitingReview.items.map((a) => a.attemptId)).not.toContain(
      w.attemptA1.id,
    )
    await review(false)
    expect((await attention(w.instructorA)).awaitingReview.items.map((a) => a.attemptId)).toContain(
      w.attemptA1.id,
    )
    const another = await expectStatus(submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id }), 201)
    await expectStatus(
      supertest(api.app)
        .post(`/api/attempts/${another.body.id}/feedback`)
        .set(bearer(w.instructorA.token))
        .send({ body: 'Looked at it' }),
      201,
    )
    expect((await attention(w.instructorA)).awaitingReview.items.map((a) => a.attemptId)).not.toContain(
      another.body.id,
    )
  })

  it('names this week’s safety violations in words', async () => {
    const unsafe = attemptFixtures((n) => n === 'two-wire-run-stop--mistake-not-proved-dead')[0]!
    const attempt = await expectStatus(
      submit(api, w.apprenticeA2, { assignmentId: w.assignmentA.id, events: unsafe.events }),
      201,
    )
    const item = (await attention(w.instructorA)).safetyViolations.find(
      (v) => v.attemptId === attempt.body.id,
    )!
    expect(item.userName).toBe('Abel Apprentice')
    expect(item.violations.length).toBeGreaterThan(0)
    expect(item.violations.map((v) => v.kind)).toContain('Work before proving dead')
    expect(JSON.stringify(item.violations)).not.toMatch(/workWithout|workWhile/)
  })

  it('lists work closing within 48 hours with who has not submitted, and work missed lately', async () => {
    const closing = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      title: 'Closing tomorrow',
      opensAt: hours(-48),
      dueAt: hours(24),
    })
    const later = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      title: 'Due next week',
      opensAt: hours(-48),
      dueAt: hours(24 * 7),
    })
    const gone = await createAssignment(api, w.instructorA, w.cohortA, w.scenario.id, {
      title: 'Due yesterday',
      opensAt: hours(-24 * 5),
      dueAt: hours(-24),
    })
    await expectStatus(submit(api, w.apprenticeA1, { assignmentId: closing.id }), 201)
    await expectStatus(submit(api, w.apprenticeA2, { assignmentId: closing.id, status: 'inProgress' }), 201)
    const a = await attention(w.instructorA)
    const soon = a.closingSoon.find((c) => c.assignmentId === closing.id)!
    expect(soon.people.map((p) => [p.name, p.inProgress])).toEqual([['Abel Apprentice', true]])
    expect(a.closingSoon.map((c) => c.assignmentId)).not.toContain(later.id)
    const missed = a.missed.find((m) => m.assignmentId === gone.id)!
    expect(missed.people.map((p) => p.name)).toEqual(['Abel Apprentice', 'Ada Apprentice'])
    expect((await attention(w.instructorB)).missed.map((m) => m.assignmentId)).not.toContain(gone.id)
  })

  it('leaves archived cohorts out', async () => {
    await expectStatus(
      supertest(api.app)
        .patch(`/api/cohorts/${w.cohortA.id}`)
        .set(bearer(w.instructorA.token))
        .send({ archived: true }),
      200,
    )
    const a = await attention(w.instructorA)
    expect(a.awaitingReview.total).toBe(0)
    expect(a.missed).toEqual([])
    await expectStatus(
      supertest(api.app)
        .patch(`/api/cohorts/${w.cohortA.id}`)
        .set(bearer(w.instructorA.token))
        .send({ archived: false }),
      200,
    )
  })
})
