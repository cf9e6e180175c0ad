// LTI 1.3 login and launch against the fake platform: a complete launch signs the person in (account, cohort
// and enrolment made on first sight), and every check of the 1EdTech Security Framework §5.1.3 refuses what
// it must. Each refusal names its reason in a response header (the page itself speaks plain words).
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  CohortEntity,
  EnrollmentEntity,
  LtiContextEntity,
  LtiIdentityEntity,
  LtiLoginEntity,
  UserEntity,
} from '../../server/entities'
import { hashToken } from '../../server/infrastructure/security/tokens'
import {
  bearer,
  createTestApi,
  DEFAULT_RATE_LIMITS,
  type TestApi,
  type TestUser,
} from '../support/api-harness'
import { FakeLtiPlatform, ROLE } from '../support/fake-lti-platform'
import {
  codeOf,
  launch,
  launchSession,
  LAUNCH_URL,
  postLaunch,
  registerPlatform,
  startFakePlatform,
  startLogin,
} from '../support/lti-harness'

const REFUSAL = 'x-slipway-lti-refusal'

describe('LTI 1.3 launch', () => {
  let api: TestApi
  let admin: TestUser
  let platform: FakeLtiPlatform

  beforeAll(async () => {
    api = await createTestApi()
    admin = await api.createUser('admin')
    platform = await startFakePlatform(api)
    await registerPlatform(api, admin, platform)
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
    platform.addPerson({ sub: 'learner-2', roles: [ROLE.learner] }) // shares neither name nor e-mail
  })
  afterAll(async () => {
    await platform?.stop()
    await api?.close()
  })

  describe('a complete launch', () => {
    it('refuses a learner before the course has a cohort (an instructor opens it first)', async () => {
      const response = await launch(api, platform, { person: 'learner-1' })
      expect(response.status).toBe(403)
      expect(response.headers[REFUSAL]).toBe('not_allowed')
      expect(response.text).toMatch(/not set up in Slipway yet/)
    })

    it('creates the instructor (by issuer and subject) and a cohort for the course, and opens the cohort', async () => {
      const { session, setCookie } = await launchSession(api, platform, { person: 'inst-1' })
      expect(session.user).toMatchObject({
        name: 'Tamsin Rook',
        email: 'tamsin.rook@harbour.example',
        role: 'instructor',
      })
      expect(session.destination.kind).toBe('cohort')
      const identity = await api.dataSource
        .getRepository(LtiIdentityEntity)
        .findOneByOrFail({ subject: 'inst-1' })
      expect(identity).toMatchObject({ issuer: platform.issuer, userId: session.user.id })
      const context = await api.dataSource
        .getRepository(LtiContextEntity)
        .findOneByOrFail({ contextId: platform.contextId })
      const cohort = await api.dataSource
        .getRepository(CohortEntity)
        .findOneByOrFail({ id: context.cohortId })
      expect(cohort).toMatchObject({ name: platform.contextTitle, ownerId: session.user.id })
      expect(context.membershipsUrl).toBe(platform.membershipsUrl())
      // The framed session's refresh cookie: partitioned, cross-site, HTTP only, only for its own route.
      expect(setCookie).toMatch(/^slipway_lti_refresh=/)
      expect(setCookie).toMatch(/Partitioned/i)
      expect(setCookie).toMatch(/SameSite=None/i)
      expect(setCookie).toMatch(/Secure/i)
      expect(setCookie).toMatch(/HttpOnly/i)
      expect(setCookie).toMatch(/Path=\/api\/lti\/session/)
      // The access token works like any other.
      const me = await supertest(api.app).get('/api/auth/me').set(bearer(session.accessToken))
      expect(me.body.user.id).toBe(session.user.id)
    })

    it('matches the same person again on the next launch rather than making a second account', async () => {
      const before = await api.dataSource.getRepository(UserEntity).count()
      const { session } = await launchSession(api, platform, { person: 'inst-1' })
      expect(await api.dataSource.getRepository(UserEntity).count()).toBe(before)
      expect(session.user.name).toBe('Tamsin Rook')
    })

    it('enrols a learner as an apprentice in the course cohort', async () => {
      const { session } = await launchSession(api, platform, { person: 'learner-1' })
      expect(session.user.role).toBe('apprentice')
      // No exercise is linked to this activity yet.
      expect(session.destination.kind).toBe('notReady')
      const context = await api.dataSource
        .getRepository(LtiContextEntity)
        .findOneByOrFail({ contextId: platform.contextId })
      expect(
        await api.dataSource
          .getRepository(EnrollmentEntity)
          .countBy({ cohortId: context.cohortId, userId: session.user.id }),
      ).toBe(1)
    })

    it('gives a person who shares no name or address a readable name and an address mail never goes to', async () => {
      const { session } = await launchSession(api, platform, { person: 'learner-2' })
      expect(session.user.name).toBe('Course member (name not shared)')
      // The account holds a reserved address mail is never sent to; screens show none.
      expect(session.user.email).toBe('')
      const stored = await api.dataSource.getRepository(UserEntity).findOneByOrFail({ id: session.user.id })
      expect(stored.email).toMatch(/@platform\.invalid$/)
    })

    it('hands over each launch once: the code cannot be swapped twice', async () => {
      const code = codeOf(await launch(api, platform, { person: 'inst-1' }))
      expect((await supertest(api.app).post('/api/lti/session').send({ code })).status).toBe(200)
      const again = await supertest(api.app).post('/api/lti/session').send({ code })
      expect(again.status).toBe(400)
      expect(again.body.error.code).toBe('lti_launch_invalid')
    })

    it('refreshes a framed session through its partitioned cookie, and signs it out', async () => {
      const { refreshCookie } = await launchSession(api, platform, { person: 'inst-1' })
      const refreshed = await supertest(api.app).post('/api/lti/session/refresh').set('Cookie', refreshCookie)
      expect(refreshed.status).toBe(200)
      expect(refreshed.body.accessToken).toEqual(expect.any(String))
      const next = ([] as string[]).concat(refreshed.headers['set-cookie'] ?? [])[0]!.split(';')[0]!
      expect((await supertest(api.app).post('/api/lti/session/sign-out').set('Cookie', next)).status).toBe(
        204,
      )
      expect((await supertest(api.app).post('/api/lti/session/refresh').set('Cookie', next)).status).toBe(401)
    })

    it('accepts several audiences when the authorised party is Slipway', async () => {
      const response = await launch(api, platform, { person: 'inst-1' }, (c) => ({
        ...c,
        aud: [platform.clientId, 'another-tool'],
        azp: platform.clientId,
      }))
      expect(response.status).toBe(303)
    })

    it('fetches the key set again for a key id it has not seen (the platform rotated its keys)', async () => {
      await new Promise((resolve) => setTimeout(resolve, 1100)) // past the one-second refetch guard
      await platform.rotateKey()
      const response = await launch(api, platform, { person: 'inst-1' })
      expect(response.status).toBe(303)
    })

    it('allows only registered platforms to frame its pages', async () => {
      const refused = await postLaunch(api, { state: 'x', id_token: 'y' })
      expect(refused.headers['content-security-policy']).toContain(`frame-ancestors ${platform.issuer}`)
      expect(refused.headers['x-frame-options']).toBeUndefined()
      const health = await supertest(api.app).get('/api/health')
      expect(health.headers['content-security-policy']).toContain("frame-ancestors 'none'")
    })
  })

  it('limits how often one address may start logins and launches', async () => {
    const limited = await createTestApi({
      rateLimits: { ...DEFAULT_RATE_LIMITS, ltiLaunch: { windowMs: 60_000, limit: 2 } },
    })
    try {
      const query = { iss: 'https://stranger.example', login_hint: 'x', target_link_uri: LAUNCH_URL }
      for (let i = 0; i < 2; i++) {
        expect((await supertest(limited.app).get('/api/lti/login').query(query)).status).toBe(400)
      }
      const third = await supertest(limited.app).get('/api/lti/login').query(query)
      expect(third.status).toBe(429)
      expect(third.headers['retry-after']).toEqual(expect.any(String))
    } finally {
      await limited.close()
    }
  })

  describe('login initiation refuses', () => {
    it('an issuer that is not registered', async () => {
      const response = await supertest(api.app)
        .get('/api/lti/login')
        .query({ iss: 'https://stranger.example', login_hint: 'x', target_link_uri: LAUNCH_URL })
      expect(response.status).toBe(400)
      expect(response.headers[REFUSAL]).toBe('unknown_platform')
    })

    it('a target outside Slipway (no open redirect)', async () => {
      const response = await supertest(api.app)
        .get('/api/lti/login')
        .query({ iss: platform.issuer, login_hint: 'x', target_link_uri: 'https://evil.example/phish' })
      expect(response.headers[REFUSAL]).toBe('wrong_target')
    })

    it('a deployment that is not registered', async () => {
      const response = await supertest(api.app).get('/api/lti/login').query({
        iss: platform.issuer,
        login_hint: 'x',
        target_link_uri: LAUNCH_URL,
        lti_deployment_id: 'other',
      })
      expect(response.headers[REFUSAL]).toBe('unknown_deployment')
    })

    it('answers with an authorisation request carrying state, nonce and the launch URL', async () => {
      const login = await startLogin(api, platform)
      expect(login.redirect.origin + login.redirect.pathname).toBe(`${platform.url}/auth`)
      expect(Object.fromEntries(login.redirect.searchParams)).toMatchObject({
        scope: 'openid',
        response_type: 'id_token',
        response_mode: 'form_post',
        prompt: 'none',
        client_id: platform.clientId,
        redirect_uri: LAUNCH_URL,
        login_hint: 'opaque-hint',
      })
      expect(login.cookie).toMatch(/^slipway_lti_/)
    })
  })

  describe('the launch refuses', () => {
    const person = { person: 'inst-1' }

    async function refusedWith(
      reason: string,
      change: Parameters<typeof launch>[3],
      sign?: (claims: Parameters<FakeLtiPlatform['sign']>[0]) => Promise<string>,
    ) {
      const login = await startLogin(api, platform)
      const claims = change!({ ...platform.launchClaims(person), nonce: login.nonce })
      const idToken = sign ? await sign(claims) : await platform.sign(claims)
      const response = await postLaunch(api, { id_token: idToken, state: login.state }, login.cookie)
      expect(response.status).toBeGreaterThanOrEqual(400)
      expect(response.headers[REFUSAL]).toBe(reason)
      expect(response.headers['set-cookie'] ?? []).not.toEqual(
        expect.arrayContaining([expect.stringMatching(/slipway_lti_refresh/)]),
      )
      return response
    }
    const same = (c: Parameters<FakeLtiPlatform['sign']>[0]) => c

    it('a wrong signature (a key the platform never published, under its current key id)', async () => {
      const forger = await platform.unpublishedKey()
      await refusedWith('wrong_signature', same, (c) =>
        platform.sign(c, { key: forger, kid: platform.currentKid }),
      )
    })

    it('an unknown key id, after fetching the key set once more', async () => {
      const forger = await platform.unpublishedKey()
      await new Promise((resolve) => setTimeout(resolve, 1100))
      await refusedWith('unknown_key', same, (c) => platform.sign(c, { key: forger }))
    })

    it('a wrong issuer', async () => {
      await refusedWith('wrong_issuer', (c) => ({ ...c, iss: 'https://another-platform.example' }))
    })

    it('a wrong audience', async () => {
      await refusedWith('wrong_audience', (c) => ({ ...c, aud: 'someone-elses-client' }))
    })

    it('several audiences without an authorised party, or with another one', async () => {
      await refusedWith('wrong_authorised_party', (c) => ({ ...c, aud: [platform.clientId, 'another-tool'] }))
      await refusedWith('wrong_authorised_party', (c) => ({ ...c, aud: [platform.clientId, 'x'], azp: 'x' }))
    })

    it('an expired message (beyond the minute of clock difference allowed)', async () => {
      const now = Math.floor(Date.now() / 1000)
      await refusedWith('expired', (c) => ({ ...c, iat: now - 300, exp: now - 61 }))
    })

    it('a message issued in the future or long ago', async () => {
      const now = Math.floor(Date.now() / 1000)
      await refusedWith('issued_at_out_of_range', (c) => ({ ...c, iat: now + 600, exp: now + 900 }))
      await refusedWith('issued_at_out_of_range', (c) => ({ ...c, iat: now - 3600, exp: now + 300 }))
    })

    it('a replayed launch: the same state and nonce a second time', async () => {
      const login = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: login.nonce })
      const first = await postLaunch(api, { id_token: idToken, state: login.state }, login.cookie)
      expect(first.status).toBe(303)
      const replay = await postLaunch(api, { id_token: idToken, state: login.state }, login.cookie)
      expect(replay.status).toBe(401)
      expect(replay.headers[REFUSAL]).toBe('nonce_replayed')
    })

    it('a replayed message under a fresh login (its nonce answers another sign-in)', async () => {
      const first = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: first.nonce })
      expect((await postLaunch(api, { id_token: idToken, state: first.state }, first.cookie)).status).toBe(
        303,
      )
      const second = await startLogin(api, platform)
      const replay = await postLaunch(api, { id_token: idToken, state: second.state }, second.cookie)
      expect(replay.headers[REFUSAL]).toBe('nonce_mismatch')
    })

    it('a missing state', async () => {
      const login = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: login.nonce })
      const response = await postLaunch(api, { id_token: idToken }, login.cookie)
      expect(response.status).toBe(400)
      expect(response.headers[REFUSAL]).toBe('state_missing')
    })

    it('a state Slipway never issued', async () => {
      const login = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: login.nonce })
      const response = await postLaunch(api, { id_token: idToken, state: 'made-up-state' }, login.cookie)
      expect(response.headers[REFUSAL]).toBe('state_unknown')
    })

    it('a state bound to another browser (its cookie is another login’s)', async () => {
      const mine = await startLogin(api, platform)
      const theirs = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: mine.nonce })
      const stolenCookie = `${mine.cookie.split('=')[0]}=${theirs.cookie.split('=')[1]}`
      const response = await postLaunch(api, { id_token: idToken, state: mine.state }, stolenCookie)
      expect(response.headers[REFUSAL]).toBe('state_mismatch')
    })

    it('a state whose cookie the browser did not keep, offering the same login in a new window', async () => {
      const login = await startLogin(api, platform)
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: login.nonce })
      const response = await postLaunch(api, { id_token: idToken, state: login.state })
      expect(response.status).toBe(401)
      expect(response.headers[REFUSAL]).toBe('state_cookie_missing')
      const link = /href="([^"]+)" target="_blank"/.exec(response.text)![1]!.replaceAll('&amp;', '&')
      const again = new URL(link)
      expect(again.pathname).toBe('/api/lti/login')
      expect(again.searchParams.get('iss')).toBe(platform.issuer)
      expect(again.searchParams.get('login_hint')).toBe('opaque-hint')
      // The login it leads to is a fresh one with its own state and cookie.
      const fresh = await supertest(api.app).get(again.pathname + again.search)
      expect(fresh.status).toBe(302)
    })

    it('an unregistered deployment', async () => {
      await refusedWith('unknown_deployment', (c) => ({
        ...c,
        'https://purl.imsglobal.org/spec/lti/claim/deployment_id': 'deployment-nobody-registered',
      }))
    })

    it('a wrong message type', async () => {
      await refusedWith('wrong_message_type', (c) => ({
        ...c,
        'https://purl.imsglobal.org/spec/lti/claim/message_type': 'LtiSubmissionReviewRequest',
      }))
    })

    it('another LTI version', async () => {
      await refusedWith('wrong_version', (c) => ({
        ...c,
        'https://purl.imsglobal.org/spec/lti/claim/version': '1.1.0',
      }))
    })

    it('a message that is not a signed token at all', async () => {
      const login = await startLogin(api, platform)
      const response = await postLaunch(api, { id_token: 'not-a-jwt', state: login.state }, login.cookie)
      expect(response.headers[REFUSAL]).toBe('token_malformed')
    })

    it('an expired login (the platform answered too late)', async () => {
      const login = await startLogin(api, platform)
      await api.dataSource
        .getRepository(LtiLoginEntity)
        .update(
          { stateHash: hashToken(login.state) },
          { expiresAt: new Date(Date.now() - 1000).toISOString() },
        )
      const idToken = await platform.sign({ ...platform.launchClaims(person), nonce: login.nonce })
      const response = await postLaunch(api, { id_token: idToken, state: login.state }, login.cookie)
      expect(response.headers[REFUSAL]).toBe('state_expired')
    })
  })
})
