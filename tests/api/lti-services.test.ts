// LTI Advantage against the fake platform: registration and key rotation, deep linking (the signed answer
// the platform receives), launches of the linked activity, grades sent back (Assignment and Grade Services:
// best or latest, overrides, retries and refusals through the durable job queue, plain-words failures) and
// rosters pulled (Names and Role Provisioning).
import { readFileSync } from 'node:fs'
import supertest from 'supertest'
import { decodeJwt } from 'jose'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ScoreSyncList } from '../../shared/api/lti'
import { JobEntity, LtiResourceLinkEntity } from '../../server/entities'
import { scorePostJob } from '../../server/lti/score-post-job'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { ROLE, type FakeLtiPlatform } from '../support/fake-lti-platform'
import { launchSession, registerPlatform, startFakePlatform } from '../support/lti-harness'
import { EMPTY_LOG, expectStatus, submit } from '../support/world'

const reference = JSON.parse(
  readFileSync('tests/fixtures/attempts/two-wire-run-stop--reference.json', 'utf8'),
)
const DL = 'https://purl.imsglobal.org/spec/lti-dl/claim/'

describe('LTI Advantage services', () => {
  let api: TestApi
  let admin: TestUser
  let platform: FakeLtiPlatform
  let platformId: string
  let instructorToken: string
  let cohortId: string
  let assignmentId: string
  let learnerToken: string
  let learnerId: string

  beforeAll(async () => {
    api = await createTestApi()
    admin = await api.createUser('admin')
    platform = await startFakePlatform(api)
    platformId = (await registerPlatform(api, admin, platform)).id
    platform.addPerson({
      sub: 'inst-1',
      name: 'Tamsin Rook',
      email: 'tamsin.rook@harbour.example',
      roles: [ROLE.instructor],
    })
    platform.addPerson({
      sub: 'learner-1',
      name: 'Pell Ardent',
      email: 'pell.ardent@harbour.example',
      roles: [ROLE.learner],
    })
  })
  afterAll(async () => {
    await platform?.stop()
    await api?.close()
  })

  const admins = () => supertest(api.app)

  describe('registration', () => {
    it('lists the platform with its deployments and the values its administrator enters', async () => {
      const list = await expectStatus(admins().get('/api/lti/platforms').set(bearer(admin.token)), 200)
      expect(list.body.items).toEqual([
        expect.objectContaining({
          issuer: platform.issuer,
          clientId: platform.clientId,
          deploymentIds: ['deployment-1'],
        }),
      ])
      const tool = await expectStatus(admins().get('/api/lti/tool').set(bearer(admin.token)), 200)
      expect(tool.body).toMatchObject({
        loginInitiationUrl: 'http://slipway.test/api/lti/login',
        launchUrl: 'http://slipway.test/api/lti/launch',
        redirectUris: ['http://slipway.test/api/lti/launch'],
        jwksUrl: 'http://slipway.test/api/lti/jwks',
        deepLinkingUrl: 'http://slipway.test/api/lti/launch',
      })
      expect(JSON.stringify(tool.body)).not.toMatch(/PRIVATE|privateKey/)
    })

    it('refuses a second registration of the same issuer and client id, and a plain-http remote issuer', async () => {
      const again = await admins()
        .post('/api/lti/platforms')
        .set(bearer(admin.token))
        .send(platform.registration)
      expect(again.status).toBe(409)
      const insecure = await admins()
        .post('/api/lti/platforms')
        .set(bearer(admin.token))
        .send({ ...platform.registration, issuer: 'http://learn.example.edu', clientId: 'other' })
      expect(insecure.status).toBe(400)
      expect(insecure.body.error.details.fields.issuer).toBeDefined()
    })

    it('rotates its key: a new current key, the previous one still published', async () => {
      const before = (await admins().get('/api/lti/jwks')).body.keys as { kid: string }[]
      const rotated = await expectStatus(
        admins().post('/api/lti/tool/keys/rotate').set(bearer(admin.token)),
        200,
      )
      const current = rotated.body.keys.find((k: { state: string }) => k.state === 'current')
      expect(before.map((k) => k.kid)).not.toContain(current.kid)
      const after = (await admins().get('/api/lti/jwks')).body.keys as {
        kid: string
        n: string
        d?: string
      }[]
      expect(after.map((k) => k.kid)).toEqual(
        expect.arrayContaining([current.kid, ...before.map((k) => k.kid)]),
      )
      expect(after.every((k) => k.d === undefined)).toBe(true) // public parts only
    })
  })

  describe('deep linking', () => {
    it('lets the instructor pick a scenario, and the platform receives a signed resource link for it', async () => {
      const { session } = await launchSession(api, platform, {
        person: 'inst-1',
        messageType: 'LtiDeepLinkingRequest',
      })
      instructorToken = session.accessToken
      expect(session.destination.kind).toBe('deepLinking')
      const requestId = (session.destination as { requestId: string }).requestId
      const request = await expectStatus(
        admins().get(`/api/lti/deep-linking/${requestId}`).set(bearer(instructorToken)),
        200,
      )
      cohortId = request.body.cohortId
      expect(request.body.courseTitle).toBe(platform.contextTitle)
      const scenario = (await admins().get('/api/scenarios/two-wire-run-stop').set(bearer(instructorToken)))
        .body
      const answer = await expectStatus(
        admins()
          .post(`/api/lti/deep-linking/${requestId}`)
          .set(bearer(instructorToken))
          .send({
            scenarioId: scenario.id,
            title: 'Two-wire run/stop, graded',
            opensAt: new Date(Date.now() - 60_000).toISOString(),
            dueAt: new Date(Date.now() + 7 * 86_400_000).toISOString(),
            attemptLimit: 5,
            assistanceLevel: 'assessment',
            scorePolicy: 'best',
          }),
        201,
      )
      assignmentId = answer.body.assignmentId
      // The level chosen on the platform's linking page is the assignment's (attempts start at it).
      const linked = await admins().get(`/api/assignments/${assignmentId}`).set(bearer(instructorToken))
      expect(linked.body).toMatchObject({ assistanceLevel: 'assessment', hintsAllowed: false })
      const returnPath = new URL(answer.body.returnPageUrl).pathname
      const page = await expectStatus(admins().get(returnPath), 200)
      expect(page.headers['content-security-policy']).toContain(`form-action ${platform.url}`)
      const action = /action="([^"]+)"/.exec(page.text)![1]
      expect(action).toBe(`${platform.url}/deep-link-return`)
      const jwt = /name="JWT" value="([^"]+)"/.exec(page.text)![1]!
      // The page posts it; here the test does, and the platform verifies it against Slipway's key set.
      await expectStatus(
        supertest(platform.url).post('/deep-link-return').type('form').send({ JWT: jwt }),
        200,
      )
      const received = platform.deepLinkAnswers[0]!
      expect(received).toMatchObject({
        iss: platform.clientId,
        aud: platform.issuer,
        'https://purl.imsglobal.org/spec/lti/claim/message_type': 'LtiDeepLinkingResponse',
        'https://purl.imsglobal.org/spec/lti/claim/version': '1.3.0',
        'https://purl.imsglobal.org/spec/lti/claim/deployment_id': platform.deploymentId,
        [`${DL}data`]: 'opaque-platform-data-42',
      })
      expect(received[`${DL}content_items`]).toEqual([
        expect.objectContaining({
          type: 'ltiResourceLink',
          title: 'Two-wire run/stop, graded',
          url: 'http://slipway.test/api/lti/launch',
          custom: { slipway_assignment_id: assignmentId },
          lineItem: expect.objectContaining({ scoreMaximum: 100, resourceId: assignmentId }),
        }),
      ])
      // The answer page works once.
      expect((await admins().get(returnPath)).status).toBe(404)
      expect(decodeJwt(jwt).nonce).toEqual(expect.any(String))
    })

    it('opens the assigned exercise when a learner launches the linked activity', async () => {
      const lineItem = platform.createLineItem('activity-7', 'Two-wire run/stop, graded')
      const { session } = await launchSession(api, platform, {
        person: 'learner-1',
        resourceLinkId: 'activity-7',
        custom: { slipway_assignment_id: assignmentId },
        lineItem,
      })
      learnerToken = session.accessToken
      learnerId = session.user.id
      expect(session.destination).toEqual({
        kind: 'exercise',
        assignmentId,
        scenarioKey: 'two-wire-run-stop',
        scenarioVersion: 1,
      })
      const link = await api.dataSource
        .getRepository(LtiResourceLinkEntity)
        .findOneByOrFail({ resourceLinkId: 'activity-7' })
      expect(link).toMatchObject({ assignmentId, lineItemUrl: lineItem })
    })

    it('never opens another course’s assignment named in a custom parameter', async () => {
      const { session } = await launchSession(api, platform, {
        person: 'learner-1',
        resourceLinkId: 'activity-forged',
        custom: { slipway_assignment_id: '00000000-0000-4000-8000-000000000000' },
      })
      expect(session.destination.kind).toBe('notReady')
    })
  })

  describe('grades back', () => {
    const syncs = async () =>
      (await admins().get(`/api/lti/cohorts/${cohortId}/score-sync`).set(bearer(instructorToken)))
        .body as ScoreSyncList
    const cellOf = async () => (await syncs()).cells.find((c) => c.userId === learnerId)
    /** The grade posts in the job queue, oldest first. */
    const postJobs = () =>
      api.dataSource
        .getRepository(JobEntity)
        .find({ where: { kind: scorePostJob.kind }, order: { createdAt: 'ASC' } })
    /** Runs the posts due now; `later` first makes those waiting out a retry due (no waiting in tests). */
    const runPosts = async ({ later = false } = {}) => {
      if (later) {
        await api.dataSource
          .getRepository(JobEntity)
          .update({ kind: scorePostJob.kind, status: 'queued' }, { runAt: new Date().toISOString() })
      }
      await api.jobs.worker.runDue()
    }

    it('posts the grade of a submitted attempt to the activity’s line item', async () => {
      const graded = await expectStatus(
        submit(api, { token: learnerToken } as TestUser, { assignmentId, events: reference.events }),
        201,
      )
      const score = graded.body.grade.score as number
      // Queued with the grade, in the same transaction; nothing is sent until the worker runs it.
      expect(platform.scores).toHaveLength(0)
      expect(await cellOf()).toMatchObject({ state: 'waiting' })
      expect(await postJobs()).toMatchObject([
        { status: 'queued', payload: JSON.stringify({ assignmentId, userId: learnerId }) },
      ])
      await runPosts()
      expect(platform.scores).toHaveLength(1)
      expect(platform.scores[0]).toMatchObject({
        userId: 'learner-1',
        scoreGiven: score,
        scoreMaximum: 100,
        activityProgress: 'Completed',
        gradingProgress: 'FullyGraded',
      })
      expect(await cellOf()).toMatchObject({ state: 'sent', score, tries: 1, problem: null })
      expect((await postJobs())[0]).toMatchObject({ status: 'done', attempts: 1 })
      expect((await syncs()).linkedAssignmentIds).toEqual([assignmentId])
    })

    it('keeps the best score when a worse attempt follows (the assignment counts the best)', async () => {
      const best = platform.scores.at(-1)!.scoreGiven
      await expectStatus(
        submit(api, { token: learnerToken } as TestUser, { assignmentId, events: EMPTY_LOG }),
        201,
      )
      await runPosts()
      expect(platform.scores).toHaveLength(2)
      expect(platform.scores[1]!.scoreGiven).toBe(best)
      expect(platform.scores[1]!.timestamp > platform.scores[0]!.timestamp).toBe(true)
    })

    it('sends the latest score once the assignment counts the latest, and follows an override', async () => {
      await expectStatus(
        admins()
          .patch(`/api/assignments/${assignmentId}`)
          .set(bearer(instructorToken))
          .send({ scorePolicy: 'latest' }),
        200,
      )
      const attempts = (
        await admins().get('/api/attempts').query({ assignmentId }).set(bearer(instructorToken))
      ).body.items
      const latest = attempts.find((a: { grade: { score: number } }) => a.grade.score < 50) ?? attempts[0]
      await expectStatus(
        admins()
          .post(`/api/attempts/${latest.id}/grade-override`)
          .set(bearer(instructorToken))
          .send({ score: 37, passed: false, reason: 'Meter left on the wrong range' }),
        200,
      )
      await runPosts()
      expect(platform.scores.at(-1)?.scoreGiven).toBe(37)
      expect(await cellOf()).toMatchObject({ state: 'sent', score: 37 })
    })

    it('queues one post for grades that change again before it runs, and sends the newest', async () => {
      const attempts = (
        await admins().get('/api/attempts').query({ assignmentId }).set(bearer(instructorToken))
      ).body.items
      const counting = attempts.find((a: { grade: { score: number } }) => a.grade.score === 37)
      const before = (await postJobs()).length
      const sent = platform.scores.length
      for (const score of [41, 43]) {
        await expectStatus(
          admins()
            .post(`/api/attempts/${counting.id}/grade-override`)
            .set(bearer(instructorToken))
            .send({ score, passed: false, reason: 'Reviewed the isolation steps again' }),
          200,
        )
      }
      expect(await postJobs()).toHaveLength(before + 1)
      await runPosts()
      expect(platform.scores.slice(sent).map((s) => s.scoreGiven)).toEqual([43])
    })

    it('tries again when the platform is briefly unavailable', async () => {
      platform.failNextScores = 1
      const attempts = (
        await admins().get('/api/attempts').query({ assignmentId }).set(bearer(instructorToken))
      ).body.items
      const counting = attempts.find((a: { grade: { score: number } }) => a.grade.score === 43)
      const sent = platform.scores.length
      await expectStatus(
        admins()
          .post(`/api/attempts/${counting.id}/grade-override`)
          .set(bearer(instructorToken))
          .send({ score: 64, passed: true, reason: 'Second look at the evidence' }),
        200,
      )
      await runPosts()
      expect(platform.failNextScores).toBe(0)
      expect(platform.scores).toHaveLength(sent)
      expect(await cellOf()).toMatchObject({ state: 'waiting', tries: 1 })
      expect((await cellOf())!.problem).toMatch(/status 503.*Trying again shortly/)
      const waiting = (await postJobs()).at(-1)!
      // Backoff from the job queue: not due again at once.
      expect(waiting).toMatchObject({ status: 'queued', attempts: 1 })
      expect(Date.parse(waiting.runAt)).toBeGreaterThan(Date.now())
      await runPosts({ later: true })
      expect(platform.scores).toHaveLength(sent + 1)
      expect(platform.scores.at(-1)!.scoreGiven).toBe(64)
      expect(await cellOf()).toMatchObject({ state: 'sent', tries: 2, problem: null })
    })

    it('sends a newer grade at once, with fresh attempts, rather than after an older one’s backoff', async () => {
      platform.failNextScores = 1
      const attempts = (
        await admins().get('/api/attempts').query({ assignmentId }).set(bearer(instructorToken))
      ).body.items
      const counting = attempts.find((a: { grade: { score: number } }) => a.grade.score === 64)
      const override = (score: number) =>
        expectStatus(
          admins()
            .post(`/api/attempts/${counting.id}/grade-override`)
            .set(bearer(instructorToken))
            .send({ score, passed: true, reason: 'Moderated with the second assessor' }),
          200,
        )
      const sent = platform.scores.length
      const before = (await postJobs()).length
      await override(66)
      await runPosts()
      expect((await postJobs()).at(-1)).toMatchObject({ status: 'queued', attempts: 1 })
      await override(68)
      const jobs = await postJobs()
      expect(jobs).toHaveLength(before + 1)
      expect(jobs.at(-1)).toMatchObject({ status: 'queued', attempts: 0, lastError: null })
      expect(Date.parse(jobs.at(-1)!.runAt)).toBeLessThanOrEqual(Date.now())
      await runPosts()
      expect(platform.scores.slice(sent).map((s) => s.scoreGiven)).toEqual([68])
      expect(await cellOf()).toMatchObject({ state: 'sent', score: 68, tries: 1 })
    })

    it('says in plain words why an apprentice who never came from the course cannot be sent', async () => {
      const local = await api.createUser('apprentice', { name: 'Orrin Vale' })
      await expectStatus(
        admins()
          .post(`/api/cohorts/${cohortId}/invitations`)
          .set(bearer(instructorToken))
          .send({ email: local.email, name: local.user.name }),
        201,
      )
      await expectStatus(submit(api, local, { assignmentId, events: EMPTY_LOG }), 201)
      await runPosts()
      const cell = (await syncs()).cells.find((c) => c.userId === local.user.id)!
      expect(cell).toMatchObject({ state: 'failed', tries: 1 })
      expect(cell.problem).toMatch(/has not come in from Harbour Learning/)
      // Not worth retrying: the job failed at once, with the same words for the admin.
      const job = (await postJobs()).at(-1)!
      expect(job).toMatchObject({ status: 'failed', attempts: 1 })
      expect(job.lastError).toMatch(/has not come in from Harbour Learning/)

      // "Send again" queues a fresh post for every failed grade of the cohort, in one transaction.
      const retried = await expectStatus(
        admins().post(`/api/lti/cohorts/${cohortId}/score-sync/retry`).set(bearer(instructorToken)),
        200,
      )
      const again = (retried.body as ScoreSyncList).cells.find((c) => c.userId === local.user.id)
      expect(again).toMatchObject({ state: 'waiting', problem: null })
      const jobs = await postJobs()
      expect(jobs.at(-1)).toMatchObject({ status: 'queued', attempts: 0 })
      expect(jobs.at(-1)!.id).not.toBe(job.id)
      await runPosts()
      expect((await syncs()).cells.find((c) => c.userId === local.user.id)).toMatchObject({ state: 'failed' })
    })

    it('changes nothing for an assignment no platform links (standalone Slipway)', async () => {
      const other = await api.createUser('instructor')
      const cohort = (
        await admins().post('/api/cohorts').set(bearer(other.token)).send({ name: 'Standalone cohort' })
      ).body
      const list = await expectStatus(
        admins().get(`/api/lti/cohorts/${cohort.id}/score-sync`).set(bearer(other.token)),
        200,
      )
      expect(list.body).toEqual({ linkedAssignmentIds: [], cells: [] })
      const link = await expectStatus(
        admins().get(`/api/lti/cohorts/${cohort.id}`).set(bearer(other.token)),
        200,
      )
      expect(link.body).toMatchObject({ linked: false, canPullRoster: false })
    })
  })

  describe('rosters in', () => {
    it('enrols the course’s active learners, counts staff and inactive members, and names those no longer listed', async () => {
      platform.addPerson({
        sub: 'learner-3',
        name: 'Wren Holloway',
        email: 'wren.holloway@harbour.example',
        roles: [ROLE.learner],
      })
      platform.addPerson({ sub: 'learner-4', name: 'Ossian Brack', roles: [ROLE.learner] })
      platform.addPerson({ sub: 'learner-5', name: 'Left Early', roles: [ROLE.learner], status: 'Inactive' })
      const pulled = await expectStatus(
        admins().post(`/api/lti/cohorts/${cohortId}/roster-pull`).set(bearer(instructorToken)),
        200,
      )
      expect(pulled.body).toMatchObject({ enrolled: 2, alreadyEnrolled: 1, staff: 1, inactive: 1 })
      expect(pulled.body.notInCourse.map((p: { name: string }) => p.name)).toEqual(['Orrin Vale'])
      const members = (await admins().get(`/api/cohorts/${cohortId}/members`).set(bearer(instructorToken)))
        .body
      const names = (members.items ?? members).map((m: { name: string }) => m.name)
      expect(names).toEqual(expect.arrayContaining(['Pell Ardent', 'Wren Holloway', 'Ossian Brack']))
      // The platform was asked with the roster scope only.
      expect(platform.tokenRequests.at(-1)).toEqual({
        scope: 'https://purl.imsglobal.org/spec/lti-nrps/scope/contextmembership.readonly',
        ok: true,
      })
      const link = await expectStatus(
        admins().get(`/api/lti/cohorts/${cohortId}`).set(bearer(instructorToken)),
        200,
      )
      expect(link.body).toMatchObject({
        linked: true,
        platformName: 'Harbour Learning (test platform)',
        canPullRoster: true,
      })
      expect(link.body.lastRosterPullAt).toEqual(expect.any(String))
    })

    it('keeps a registration people have come in through', async () => {
      const response = await admins().delete(`/api/lti/platforms/${platformId}`).set(bearer(admin.token))
      expect(response.status).toBe(409)
    })
  })
})
