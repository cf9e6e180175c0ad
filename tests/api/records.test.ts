// Records over HTTP: the commissioning record of an attempt and the training record of an apprentice as
// PDFs (read back with pdfjs-dist), a cohort's records as one zip, and an instructor's sign-off of a
// learning outcome (recorded, audited, printed). Access by role is in access-matrix.test.ts.
import JSZip from 'jszip'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { SETTINGS, type SettingKey } from '../../shared/model'
import {
  attemptSummarySchema,
  commissioningRecordSchema,
  outcomeSignOffSchema,
  trainingRecordSummarySchema,
  withdrawnSignOffSchema,
  type AttemptSummary,
} from '../../shared/api'
import { drawSchematic, wiringOfState } from '../../shared/schematic'
import { AuditEntryEntity, OutcomeSignOffEntity, OutcomeSignOffWithdrawalEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { attemptFixtures, endState, scenarioById } from '../support/shipped-attempts'
import { buildWorld, expectStatus, submit, type World } from '../support/world'
import { readPdf } from '../unit/records/pdfText'

const binary = (res: supertest.Response, done: (err: Error | null, body: Buffer) => void) => {
  const chunks: Buffer[] = []
  res.on('data', (c: Buffer) => chunks.push(c))
  res.on('end', () => done(null, Buffer.concat(chunks)))
}

const [reference] = attemptFixtures((name) => name === 'two-wire-run-stop--reference')
const scenario = scenarioById('two-wire-run-stop')

describe('records', () => {
  let api: TestApi
  let w: World
  let passed: AttemptSummary

  const get = (path: string, token: string) =>
    supertest(api.app).get(path).set(bearer(token)).buffer(true).parse(binary)

  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    // The records are headed with the centre's name from its settings.
    await expectStatus(
      supertest(api.app)
        .patch('/api/centre')
        .set(bearer(w.admin.token))
        .send({ name: 'Kestrel Vale Training Centre', timeZone: 'UTC' }),
      200,
    )
    passed = attemptSummarySchema.parse(
      (
        await expectStatus(
          submit(api, w.apprenticeA1, { assignmentId: w.assignmentA.id, events: reference.events }),
          201,
        )
      ).body,
    )
  }, 60_000)
  afterAll(() => api.close())

  describe('commissioning record', () => {
    let text: string

    beforeAll(async () => {
      const res = await get(`/api/attempts/${passed.id}/commissioning-record.pdf`, w.apprenticeA1.token)
      expect(res.status).toBe(200)
      expect(res.headers['content-type']).toBe('application/pdf')
      expect(res.headers['content-disposition']).toMatch(
        /^attachment; filename="commissioning-record-two-wire-run-stop-attempt-2-ada-apprentice\.pdf"$/,
      )
      text = (await readPdf(res.body as Buffer)).text
    }, 60_000)

    it('prints every wire number of the wiring at submission', () => {
      const drawing = drawSchematic(wiringOfState(endState(scenario, reference.events)))
      expect(drawing.layout.wires.length).toBeGreaterThan(2)
      for (const wire of drawing.layout.wires) expect(text, wire.number).toContain(`${wire.number} `)
    })

    it('prints every setting left away from its default, by its catalogue label', () => {
      const end = endState(scenario, reference.events)
      const changed = SETTINGS.filter((def) => end.settings.active[def.key as SettingKey] !== def.default)
      expect(changed.length).toBeGreaterThan(0)
      for (const def of changed) expect(text, def.label).toContain(def.label)
    })

    it('gives the objectives and the score as the server graded them', () => {
      const grade = passed.grade!.evidence!
      expect(grade.objectives.length).toBeGreaterThan(0)
      for (const o of grade.objectives) {
        expect(text).toContain(o.title)
        expect(text).toContain(`${o.pointsEarned} / ${o.pointsPossible}`)
      }
      expect(text).toContain(`Score ${passed.grade!.score} %, passed`)
      // The apprentice's second submitted attempt on the exercise (the world's first was empty).
      expect(text).toContain('Attempt 2')
      expect(text).toContain('Ada Apprentice')
      expect(text).toContain('Kestrel Vale Training Centre')
    })

    it('carries the instructor’s feedback and grade change with its reason', async () => {
      await expectStatus(
        supertest(api.app)
          .post(`/api/attempts/${w.attemptA1.id}/feedback`)
          .set(bearer(w.instructorA.token))
          .send({ body: 'Prove the meter on a known source first.' }),
        201,
      )
      await expectStatus(
        supertest(api.app)
          .post(`/api/attempts/${w.attemptA1.id}/grade-override`)
          .set(bearer(w.instructorA.token))
          .send({ score: 12, passed: false, reason: 'Partial credit for isolating before touching.' }),
        200,
      )
      const res = await get(`/api/attempts/${w.attemptA1.id}/commissioning-record.pdf`, w.instructorA.token)
      expect(res.status).toBe(200)
      const pdf = (await readPdf(res.body as Buffer)).text
      expect(pdf).toContain('Prove the meter on a known source first.')
      expect(pdf).toContain('Reason: Partial credit for isolating before touching.')
      expect(pdf).toContain('12 %, not passed (changed by the instructor')
    }, 60_000)

    it('gives the print view the same record as JSON, with levels and settings in words', async () => {
      const res = await expectStatus(
        supertest(api.app)
          .get(`/api/attempts/${passed.id}/commissioning-record`)
          .set(bearer(w.instructorA.token)),
        200,
      )
      const record = commissioningRecordSchema.parse(res.body)
      expect(record.attempt.label).toBe('Attempt 2')
      expect(record.attempt.assistance).toBe('Standard')
      expect(record.schematic.svg).toMatch(/^<svg /)
      expect(record.trendSvg).toMatch(/^<svg /)
      expect(record.result.score).toBe(passed.grade!.score)
      const drawing = drawSchematic(wiringOfState(endState(scenario, reference.events)))
      expect(record.wires.map((x) => x.number)).toEqual(drawing.layout.wires.map((x) => x.number))
      expect(JSON.stringify(record)).not.toMatch(/"(drive|motor)\.[a-zA-Z]+"/)
    })

    it("heads the record with the centre's name and dates it on the centre's clock (Centre settings)", async () => {
      await expectStatus(
        supertest(api.app)
          .patch('/api/centre')
          .set(bearer(w.admin.token))
          .send({ timeZone: 'Pacific/Auckland' }),
        200,
      )
      try {
        const res = await expectStatus(
          supertest(api.app)
            .get(`/api/attempts/${passed.id}/commissioning-record`)
            .set(bearer(w.instructorA.token)),
          200,
        )
        const record = commissioningRecordSchema.parse(res.body)
        expect(record.centre.name).toBe('Kestrel Vale Training Centre')
        expect(record.centre.timeZone).toBe('Pacific/Auckland')
      } finally {
        await supertest(api.app).patch('/api/centre').set(bearer(w.admin.token)).send({ timeZone: 'UTC' })
      }
    })

    it('refuses an attempt still in progress with a clear reason, not a server error', async () => {
      const saved = await expectStatus(
        submit(api, w.apprenticeA1, { assignmentId: w.assignmentA.id, status: 'inProgress', events: [] }),
        201,
      )
      const res = await supertest(api.app)
        .get(`/api/attempts/${saved.body.id}/commissioning-record.pdf`)
        .set(bearer(w.apprenticeA1.token))
      expect(res.status).toBe(409)
      expect(res.body.error.message).toMatch(/not been submitted yet/)
      const json = await supertest(api.app)
        .get(`/api/attempts/${saved.body.id}/commissioning-record`)
        .set(bearer(w.apprenticeA1.token))
      expect(json.status).toBe(409)
    })

    it('answers a malformed or unknown attempt id with 400 and 404', async () => {
      const bad = await supertest(api.app)
        .get('/api/attempts/not-a-uuid/commissioning-record.pdf')
        .set(bearer(w.admin.token))
      expect(bad.status).toBe(400)
      const missing = await supertest(api.app)
        .get('/api/attempts/00000000-0000-4000-8000-000000000000/commissioning-record.pdf')
        .set(bearer(w.admin.token))
      expect(missing.status).toBe(404)
    })
  })

  describe('sign-off and training record', () => {
    const outcome = scenario.learningOutcomes[0]!
    const signOff = (token: string, body: object, who = w.apprenticeA1.user.id) =>
      supertest(api.app).post(`/api/apprentices/${who}/sign-offs`).set(bearer(token)).send(body)

    it('records an instructor’s sign-off with its note, and audits it', async () => {
      const res = await signOff(w.instructorA.token, {
        cohortId: w.cohortA.id,
        scenarioKey: scenario.id,
        outcome,
        note: '  Proved dead at the drive terminals without prompting.  ',
      })
      expect(res.status).toBe(201)
      const made = outcomeSignOffSchema.parse(res.body)
      expect(made.note).toBe('Proved dead at the drive terminals without prompting.')
      expect(made.byName).toBe('Ines Instructor-A')
      const stored = await api.dataSource.getRepository(OutcomeSignOffEntity).findOneByOrFail({ id: made.id })
      expect(stored.signedById).toBe(w.instructorA.user.id)
      const audit = await api.dataSource
        .getRepository(AuditEntryEntity)
        .findOneByOrFail({ entityType: 'outcomeSignOff', entityId: made.id })
      expect(audit.action).toBe('outcome.signedOff')
      expect(audit.actorId).toBe(w.instructorA.user.id)
      expect(audit.reason).toBe(made.note)
    })

    it('refuses a second sign-off, an unknown outcome, an empty note and a stranger', async () => {
      const body = { cohortId: w.cohortA.id, scenarioKey: scenario.id, outcome, note: 'Again' }
      expect((await signOff(w.instructorA.token, body)).status).toBe(409)
      const unknown = await signOff(w.instructorA.token, { ...body, outcome: 'Juggle three contactors' })
      expect(unknown.status).toBe(400)
      expect(unknown.body.error.details.fields.outcome).toBeDefined()
      const empty = await signOff(w.instructorA.token, {
        ...body,
        outcome: scenario.learningOutcomes[1] ?? outcome,
        note: '  ',
      })
      expect(empty.status).toBe(400)
      expect(empty.body.error.details.fields.note).toBeDefined()
      expect((await signOff(w.instructorB.token, body)).status).toBe(403)
      expect((await signOff(w.apprenticeA1.token, body)).status).toBe(403)
      // Bea is not in cohort A.
      expect((await signOff(w.instructorA.token, body, w.apprenticeB1.user.id)).status).toBe(404)
      expect((await signOff(w.instructorA.token, { ...body, scenarioKey: 'no-such-exercise' })).status).toBe(
        404,
      )
    })

    it('lists each outcome with the attempt that showed it and the sign-off (JSON)', async () => {
      const res = await expectStatus(
        supertest(api.app)
          .get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record`)
          .set(bearer(w.instructorA.token)),
        200,
      )
      const summary = trainingRecordSummarySchema.parse(res.body)
      const lines = summary.outcomes.filter((o) => o.scenarioKey === scenario.id)
      expect(lines.map((o) => o.outcome)).toEqual(scenario.learningOutcomes)
      const first = lines.find((o) => o.outcome === outcome)!
      expect(first.shownBy).toMatchObject({ attemptId: passed.id, attemptLabel: 'Attempt 2', score: 100 })
      expect(first.signOff?.note).toBe('Proved dead at the drive terminals without prompting.')
      expect(lines.filter((o) => o.signOff === null)).toHaveLength(scenario.learningOutcomes.length - 1)
    })

    it('prints the outcomes, scores and the sign-off note in the PDF', async () => {
      const res = await get(
        `/api/apprentices/${w.apprenticeA1.user.id}/training-record.pdf`,
        w.apprenticeA1.token,
      )
      expect(res.status).toBe(200)
      expect(res.headers['content-disposition']).toContain('training-record-ada-apprentice.pdf')
      const text = (await readPdf(res.body as Buffer)).text
      for (const o of scenario.learningOutcomes) expect(text).toContain(o.replace(/\s+/g, ' '))
      expect(text).toContain('Proved dead at the drive terminals without prompting.')
      expect(text).toContain('Ines Instructor-A')
      expect(text).toMatch(/Attempt 1 \d+ \w+ \d{4} 12 % \* Not passed/)
      expect(text).toMatch(/Attempt 2 \d+ \w+ \d{4} 100 % Passed/)
    }, 60_000)

    it('shows free practice to the apprentice, never to the instructor', async () => {
      await expectStatus(
        submit(api, w.apprenticeA1, { scenarioId: w.scenario.id, events: reference.events }),
        201,
      )
      const as = async (token: string) =>
        trainingRecordSummarySchema.parse(
          (
            await expectStatus(
              supertest(api.app)
                .get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record`)
                .set(bearer(token)),
              200,
            )
          ).body,
        ).attempts
      const own = await as(w.apprenticeA1.token)
      const instructors = await as(w.instructorA.token)
      expect(own).toBe(instructors + 1)
      expect(await as(w.admin.token)).toBe(own)
    })

    it('keeps records to their people: a peer and another cohort’s instructor are refused', async () => {
      const path = `/api/apprentices/${w.apprenticeA1.user.id}/training-record.pdf`
      expect((await supertest(api.app).get(path).set(bearer(w.apprenticeA2.token))).status).toBe(403)
      expect((await supertest(api.app).get(path).set(bearer(w.instructorB.token))).status).toBe(403)
      const notApprentice = await supertest(api.app)
        .get(`/api/apprentices/${w.instructorA.user.id}/training-record`)
        .set(bearer(w.admin.token))
      expect(notApprentice.status).toBe(404)
      const otherCohort = await supertest(api.app)
        .get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record?cohortId=${w.cohortB.id}`)
        .set(bearer(w.admin.token))
      expect(otherCohort.status).toBe(404)
      expect(otherCohort.body.error.message).toBe('This apprentice is not in that cohort')
    })
  })

  describe('a cohort’s training records as one zip', () => {
    it('holds one PDF per apprentice, each with their name', async () => {
      const res = await get(`/api/cohorts/${w.cohortA.id}/training-records.zip`, w.instructorA.token)
      expect(res.status).toBe(200)
      expect(res.headers['content-type']).toBe('application/zip')
      expect(res.headers['content-disposition']).toContain('training-records-cohort-a.zip')
      const zip = await JSZip.loadAsync(res.body as Buffer)
      const names = Object.keys(zip.files).sort()
      expect(names).toEqual(['training-record-abel-apprentice.pdf', 'training-record-ada-apprentice.pdf'])
      const ada = (await readPdf(await zip.file('training-record-ada-apprentice.pdf')!.async('uint8array')))
        .text
      expect(ada).toContain('Ada Apprentice')
      expect(ada).toContain('Proved dead at the drive terminals without prompting.')
    }, 60_000)

    it('says so when the cohort has nobody in it yet', async () => {
      const empty = await expectStatus(
        supertest(api.app).post('/api/cohorts').set(bearer(w.instructorA.token)).send({ name: 'Empty' }),
        201,
      )
      const res = await supertest(api.app)
        .get(`/api/cohorts/${empty.body.id}/training-records.zip`)
        .set(bearer(w.instructorA.token))
      expect(res.status).toBe(409)
      expect(res.body.error.message).toMatch(/no apprentices yet/)
    })
  })

  describe('withdrawing a sign-off', () => {
    const outcome = scenario.learningOutcomes[0]!
    const withdraw = (token: string, id: string, body: object) =>
      supertest(api.app).post(`/api/sign-offs/${id}/withdrawal`).set(bearer(token)).send(body)
    const standing = () =>
      api.dataSource.getRepository(OutcomeSignOffEntity).findOneByOrFail({
        apprenticeId: w.apprenticeA1.user.id,
        scenarioKey: scenario.id,
        outcome,
      })

    it('refuses an empty reason, an apprentice and another cohort’s instructor, and changes nothing', async () => {
      const { id } = await standing()
      const empty = await withdraw(w.instructorA.token, id, { reason: '   ' })
      expect(empty.status).toBe(400)
      expect(empty.body.error.details.fields.reason).toBeDefined()
      expect((await withdraw(w.apprenticeA1.token, id, { reason: 'Mine' })).status).toBe(403)
      expect((await withdraw(w.instructorB.token, id, { reason: 'Not mine' })).status).toBe(403)
      expect((await withdraw(w.instructorA.token, 'not-a-uuid', { reason: 'x' })).status).toBe(400)
      expect(
        (await withdraw(w.instructorA.token, '00000000-0000-4000-8000-000000000000', { reason: 'x' })).status,
      ).toBe(404)
      expect((await standing()).id).toBe(id)
    })

    it('moves the sign-off to the withdrawals with who, when and why, and audits it', async () => {
      const signed = await standing()
      const res = await withdraw(w.instructorA.token, signed.id, {
        reason: '  Signed off on the wrong apprentice’s attempt.  ',
      })
      expect(res.status).toBe(201)
      const withdrawn = withdrawnSignOffSchema.parse(res.body)
      expect(withdrawn).toMatchObject({
        id: signed.id,
        note: signed.note,
        byName: 'Ines Instructor-A',
        withdrawnByName: 'Ines Instructor-A',
        reason: 'Signed off on the wrong apprentice’s attempt.',
      })
      expect(await api.dataSource.getRepository(OutcomeSignOffEntity).findOneBy({ id: signed.id })).toBeNull()
      const kept = await api.dataSource
        .getRepository(OutcomeSignOffWithdrawalEntity)
        .findOneByOrFail({ id: signed.id })
      expect(kept).toMatchObject({ signedById: signed.signedById, withdrawnById: w.instructorA.user.id })
      const audit = await api.dataSource
        .getRepository(AuditEntryEntity)
        .findOneByOrFail({ entityId: signed.id, action: 'outcome.signOffWithdrawn' })
      expect(audit.actorId).toBe(w.instructorA.user.id)
      expect(audit.reason).toBe('Signed off on the wrong apprentice’s attempt.')
      expect(JSON.parse(audit.fromValue!)).toMatchObject({ outcome, note: signed.note })
      // Twice is a conflict, not a second withdrawal.
      const again = await withdraw(w.instructorA.token, signed.id, { reason: 'Again' })
      expect(again.status).toBe(409)
      expect(again.body.error.message).toMatch(/already been withdrawn/)
      expect(
        await api.dataSource.getRepository(AuditEntryEntity).countBy({ action: 'outcome.signOffWithdrawn' }),
      ).toBe(1)
    })

    it('shows the outcome as not signed off, with the withdrawal, in the JSON and the PDF', async () => {
      const summary = trainingRecordSummarySchema.parse(
        (
          await expectStatus(
            supertest(api.app)
              .get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record`)
              .set(bearer(w.apprenticeA1.token)),
            200,
          )
        ).body,
      )
      const line = summary.outcomes.find((o) => o.scenarioKey === scenario.id && o.outcome === outcome)!
      expect(line.signOff).toBeNull()
      expect(line.withdrawnSignOffs.map((x) => x.reason)).toEqual([
        'Signed off on the wrong apprentice’s attempt.',
      ])
      const res = await get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record.pdf`, w.admin.token)
      expect(res.status).toBe(200)
      const text = (await readPdf(res.body as Buffer)).text
      expect(text).toMatch(/0 signed off, 1 sign-off withdrawn/)
      expect(text).toMatch(
        /Sign-off by Ines Instructor-A \(\d+ \w+ \d{4}\) withdrawn by Ines Instructor-A, \d+ \w+ \d{4}: Signed off on the wrong apprentice’s attempt\./,
      )
    }, 60_000)

    it('lets the outcome be signed off again afterwards', async () => {
      const res = await supertest(api.app)
        .post(`/api/apprentices/${w.apprenticeA1.user.id}/sign-offs`)
        .set(bearer(w.instructorA.token))
        .send({
          cohortId: w.cohortA.id,
          scenarioKey: scenario.id,
          outcome,
          note: 'Seen again, on attempt 2.',
        })
      expect(res.status).toBe(201)
      const summary = trainingRecordSummarySchema.parse(
        (
          await supertest(api.app)
            .get(`/api/apprentices/${w.apprenticeA1.user.id}/training-record`)
            .set(bearer(w.instructorA.token))
        ).body,
      )
      const line = summary.outcomes.find((o) => o.scenarioKey === scenario.id && o.outcome === outcome)!
      expect(line.signOff?.note).toBe('Seen again, on attempt 2.')
      expect(line.withdrawnSignOffs).toHaveLength(1)
    })
  })
})
