// Accounts and sessions: sign-in, the password policy, rotating refresh tokens with reuse detection,
// sign-out, expired and tampered tokens, password reset by e-mail, rate limits.
import jwt from 'jsonwebtoken'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { REFRESH_COOKIE_NAME, sessionResponseSchema } from '../../shared/api'
import { PasswordResetEntity, RefreshTokenEntity, UserEntity } from '../../server/entities'
import { hashToken } from '../../server/infrastructure/security/tokens'
import { bearer, createTestApi, TEST_JWT_SECRET, TEST_PASSWORD, type TestApi } from '../support/api-harness'

const cookieOf = (response: supertest.Response) =>
  ([] as string[])
    .concat(response.headers['set-cookie'] ?? [])
    .find((c) => c.startsWith(`${REFRESH_COOKIE_NAME}=`))
    ?.split(';')[0] ?? ''

describe('sign-in and sessions', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api.close())

  it('signs in with the right password and returns an access token and an httpOnly refresh cookie', async () => {
    const { email } = await api.createUser('apprentice')
    const response = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email: email.toUpperCase(), password: TEST_PASSWORD })
    expect(response.status).toBe(200)
    const body = sessionResponseSchema.parse(response.body)
    expect(body.user.email).toBe(email)
    const setCookie = String(response.headers['set-cookie'])
    expect(setCookie).toMatch(/HttpOnly/)
    expect(setCookie).toMatch(/SameSite=Strict/)
    expect(setCookie).toMatch(/Path=\/api\/auth/)
  })

  it('refuses a wrong password with the same answer as an unknown e-mail', async () => {
    const { email } = await api.createUser('apprentice')
    const wrong = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email, password: 'not-the-password!' })
    const unknown = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email: 'nobody@slipway.test', password: 'not-the-password!' })
    expect(wrong.status).toBe(401)
    expect(unknown.status).toBe(401)
    // Every error carries its own request id; the rest must not tell the two apart.
    const withoutRequestId = ({ error: { requestId: _id, ...rest } }: { error: Record<string, unknown> }) => rest
    expect(withoutRequestId(wrong.body)).toEqual(withoutRequestId(unknown.body))
  })

  it('stores passwords as argon2id hashes, never in clear', async () => {
    const { user } = await api.createUser('apprentice')
    const row = await api.dataSource.getRepository(UserEntity).findOneByOrFail({ id: user.id })
    expect(row.passwordHash).toMatch(/^\$argon2id\$v=19\$/)
    expect(row.passwordHash).not.toContain(TEST_PASSWORD)
  })

  it('gives the signed-in user their own record', async () => {
    const { token, user } = await api.createUser('instructor')
    const response = await supertest(api.app).get('/api/auth/me').set(bearer(token))
    expect(response.status).toBe(200)
    expect(response.body.user).toMatchObject({ id: user.id, role: 'instructor' })
    expect(response.body.user).not.toHaveProperty('passwordHash')
  })

  it('rotates the refresh token and detects a reused one, ending the whole family', async () => {
    const { email } = await api.createUser('apprentice')
    const { cookie: first } = await api.signIn(email, TEST_PASSWORD)
    const refreshed = await supertest(api.app).post('/api/auth/refresh').set('Cookie', first)
    expect(refreshed.status).toBe(200)
    const second = cookieOf(refreshed)
    expect(second).not.toBe(first)

    // Reuse after the short grace period for parallel requests.
    const past = new Date(Date.now() - 60_000).toISOString()
    await api.dataSource
      .getRepository(RefreshTokenEntity)
      .update({ tokenHash: hashToken(first.split('=')[1]!) }, { revokedAt: past })
    const reused = await supertest(api.app).post('/api/auth/refresh').set('Cookie', first)
    expect(reused.status).toBe(401)
    expect(reused.body.error.code).toBe('refresh_token_reused')
    // The legitimate newer token died with its family.
    const afterReuse = await supertest(api.app).post('/api/auth/refresh').set('Cookie', second)
    expect(afterReuse.status).toBe(401)
  })

  it('ends a session 30 days after sign-in however often it is refreshed', async () => {
    const { email, user } = await api.createUser('apprentice')
    const { cookie } = await api.signIn(email, TEST_PASSWORD)
    const longAgo = new Date(Date.now() - 31 * 86_400_000).toISOString()
    await api.dataSource.getRepository(RefreshTokenEntity).update({ userId: user.id }, { createdAt: longAgo })
    const response = await supertest(api.app).post('/api/auth/refresh').set('Cookie', cookie)
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('refresh_token_invalid')
  })

  it('lets two parallel refreshes with the same cookie both succeed (grace period)', async () => {
    const { email } = await api.createUser('apprentice')
    const { cookie } = await api.signIn(email, TEST_PASSWORD)
    const [a, b] = await Promise.all([
      supertest(api.app).post('/api/auth/refresh').set('Cookie', cookie),
      supertest(api.app).post('/api/auth/refresh').set('Cookie', cookie),
    ])
    expect([a.status, b.status]).toEqual([200, 200])
    expect((await supertest(api.app).post('/api/auth/refresh').set('Cookie', cookieOf(b))).status).toBe(200)
  })

  it('treats a signed-out refresh token presented again as reuse, even at once', async () => {
    const { email } = await api.createUser('apprentice')
    const { cookie } = await api.signIn(email, TEST_PASSWORD)
    await supertest(api.app).post('/api/auth/sign-out').set('Cookie', cookie)
    const again = await supertest(api.app).post('/api/auth/refresh').set('Cookie', cookie)
    expect(again.body.error.code).toBe('refresh_token_reused')
  })

  it('answers a refresh without a cookie with a clear code', async () => {
    const response = await supertest(api.app).post('/api/auth/refresh')
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('refresh_token_missing')
  })

  it('revokes the refresh token at sign-out', async () => {
    const { email } = await api.createUser('apprentice')
    const { cookie } = await api.signIn(email, TEST_PASSWORD)
    expect((await supertest(api.app).post('/api/auth/sign-out').set('Cookie', cookie)).status).toBe(204)
    const after = await supertest(api.app).post('/api/auth/refresh').set('Cookie', cookie)
    expect(after.status).toBe(401)
  })

  it('signs out everywhere: other sessions and outstanding access tokens stop working', async () => {
    const { email, token } = await api.createUser('apprentice')
    const other = await api.signIn(email, TEST_PASSWORD)
    expect((await supertest(api.app).post('/api/auth/sign-out-everywhere').set(bearer(token))).status).toBe(
      204,
    )
    expect((await supertest(api.app).get('/api/auth/me').set(bearer(other.token))).status).toBe(401)
    expect((await supertest(api.app).post('/api/auth/refresh').set('Cookie', other.cookie)).status).toBe(401)
  })

  it('rejects an expired access token with token_expired', async () => {
    const { user } = await api.createUser('apprentice')
    const expired = jwt.sign({ role: 'apprentice', tv: 0 }, TEST_JWT_SECRET, {
      subject: user.id,
      issuer: 'slipway',
      expiresIn: -10,
    })
    const response = await supertest(api.app).get('/api/auth/me').set(bearer(expired))
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('token_expired')
  })

  it('rejects a tampered access token with token_invalid', async () => {
    const { token } = await api.createUser('apprentice')
    const [header, payload, signature] = token.split('.')
    const forged = Buffer.from(
      JSON.stringify({ ...JSON.parse(Buffer.from(payload!, 'base64url').toString()), role: 'admin' }),
    ).toString('base64url')
    const response = await supertest(api.app)
      .get('/api/auth/me')
      .set(bearer(`${header}.${forged}.${signature}`))
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('token_invalid')
  })

  it('rejects a request with no token with unauthenticated', async () => {
    const response = await supertest(api.app).get('/api/auth/me')
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('unauthenticated')
  })

  it('explains the password policy when a new password is too short', async () => {
    const { token } = await api.createUser('apprentice')
    const response = await supertest(api.app)
      .post('/api/auth/change-password')
      .set(bearer(token))
      .send({ currentPassword: TEST_PASSWORD, newPassword: 'short' })
    expect(response.status).toBe(400)
    expect(response.body.error.details.fields.newPassword[0]).toMatch(/at least 12 characters/)
  })

  it('accepts a long passphrase (64+ characters) as a password', async () => {
    const { token, email } = await api.createUser('apprentice')
    const phrase = 'the drive must be isolated locked and proven dead before the lid comes off'
    expect(phrase.length).toBeGreaterThan(64)
    const response = await supertest(api.app)
      .post('/api/auth/change-password')
      .set(bearer(token))
      .send({ currentPassword: TEST_PASSWORD, newPassword: phrase })
    expect(response.status).toBe(200)
    await expect(api.signIn(email, phrase)).resolves.toHaveProperty('token')
    // Earlier sessions end after a password change.
    expect((await supertest(api.app).get('/api/auth/me').set(bearer(token))).status).toBe(401)
  })

  it('refuses a deactivated account', async () => {
    const { email, user } = await api.createUser('apprentice')
    await api.dataSource.getRepository(UserEntity).update({ id: user.id }, { active: false })
    const response = await supertest(api.app)
      .post('/api/auth/sign-in')
      .send({ email, password: TEST_PASSWORD })
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('account_inactive')
  })
})

describe('password reset by e-mail', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api.close())

  const tokenFrom = (text: string) => decodeURIComponent(/reset-password\?token=([^\s"<]+)/.exec(text)![1]!)

  it('mails a single-use link that sets a new password and ends old sessions', async () => {
    const { email, token: oldToken } = await api.createUser('apprentice', { name: 'Wendeline Orrick' })
    const requested = await supertest(api.app).post('/api/auth/password-reset').send({ email })
    expect(requested.status).toBe(202)
    const message = (await api.mail()).find((m) => m.toAddress.includes(email))!
    expect(message.subject).toBe('Reset your Slipway password')
    expect(message.text).toContain('Hello Wendeline Orrick')
    expect(message.text).toContain('http://slipway.test/reset-password?token=')
    expect(message.html).toContain('<a href="http://slipway.test/reset-password?token=')
    const resetToken = tokenFrom(message.text)

    const confirmed = await supertest(api.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: resetToken, password: 'a brand new bench password' })
    expect(confirmed.status).toBe(200)
    await expect(api.signIn(email, 'a brand new bench password')).resolves.toHaveProperty('token')
    expect((await supertest(api.app).get('/api/auth/me').set(bearer(oldToken))).status).toBe(401)

    const again = await supertest(api.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: resetToken, password: 'yet another new password' })
    expect(again.status).toBe(400)
    expect(again.body.error.code).toBe('reset_token_invalid')
  })

  it('spends every outstanding reset link once one of them is used', async () => {
    const { email } = await api.createUser('apprentice')
    await supertest(api.app).post('/api/auth/password-reset').send({ email })
    await supertest(api.app).post('/api/auth/password-reset').send({ email })
    const [first, second] = (await api.mail())
      .filter((m) => m.toAddress === email)
      .map((m) => tokenFrom(m.text))
    expect(first).not.toBe(second)
    const used = await supertest(api.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: second, password: 'the newest bench password' })
    expect(used.status).toBe(200)
    const stale = await supertest(api.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token: first, password: 'an older link attempt here' })
    expect(stale.status).toBe(400)
  })

  it('refuses a reset link after it expires', async () => {
    const { email, user } = await api.createUser('apprentice')
    await supertest(api.app).post('/api/auth/password-reset').send({ email })
    const token = tokenFrom((await api.mail()).find((m) => m.toAddress === email)!.text)
    await api.dataSource
      .getRepository(PasswordResetEntity)
      .update({ userId: user.id }, { expiresAt: new Date(Date.now() - 1000).toISOString() })
    const response = await supertest(api.app)
      .post('/api/auth/password-reset/confirm')
      .send({ token, password: 'too late for this link' })
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('reset_token_invalid')
  })

  it('answers 202 for an unknown address and sends nothing', async () => {
    const before = (await api.mail()).length
    const response = await supertest(api.app)
      .post('/api/auth/password-reset')
      .send({ email: 'ghost@slipway.test' })
    expect(response.status).toBe(202)
    expect((await api.mail()).length).toBe(before)
  })
})

describe('rate limits', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({
      scenarios: false,
      rateLimits: {
        signIn: { windowMs: 60_000, limit: 3 },
        passwordReset: { windowMs: 60_000, limit: 2 },
        invitations: { windowMs: 60_000, limit: 2 },
        ltiLaunch: { windowMs: 60_000, limit: 100 },
      },
    })
  })
  afterAll(() => api.close())

  it('answers the fourth sign-in within the window with 429 and Retry-After', async () => {
    const attempt = () =>
      supertest(api.app)
        .post('/api/auth/sign-in')
        .send({ email: 'x@slipway.test', password: 'whatever-it-is' })
    for (let i = 0; i < 3; i++) expect((await attempt()).status).toBe(401)
    const limited = await attempt()
    expect(limited.status).toBe(429)
    expect(limited.body.error.code).toBe('rate_limited')
    expect(Number(limited.headers['retry-after'])).toBeGreaterThan(0)
  })

  it('draws every invitation route on one budget', async () => {
    const token = 'y'.repeat(43)
    expect((await supertest(api.app).get(`/api/invitations/${token}`)).status).toBe(404)
    expect(
      (
        await supertest(api.app)
          .post(`/api/invitations/${token}/accept`)
          .send({ password: 'long enough password' })
      ).status,
    ).toBe(404)
    const limited = await supertest(api.app).get(`/api/invitations/${token}`)
    expect(limited.status).toBe(429)
    expect(limited.headers['retry-after']).toBeDefined()
  })

  it('limits password-reset requests separately', async () => {
    const ask = () => supertest(api.app).post('/api/auth/password-reset').send({ email: 'x@slipway.test' })
    expect((await ask()).status).toBe(202)
    expect((await ask()).status).toBe(202)
    expect((await ask()).status).toBe(429)
  })
})
