// Access tokens under attack: tampered, expired, wrong-algorithm, wrong-issuer and stale tokens are all
// refused with 401; refresh-token reuse ends the session family; sign-in is throttled per client.
import { generateKeyPairSync } from 'node:crypto'
import fc from 'fast-check'
import jwt from 'jsonwebtoken'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { UserEntity } from '../../server/entities'
import {
  bearer,
  createTestApi,
  DEFAULT_RATE_LIMITS,
  TEST_JWT_SECRET,
  TEST_PASSWORD,
  type TestApi,
  type TestUser,
} from '../support/api-harness'

const b64 = (value: object) => Buffer.from(JSON.stringify(value)).toString('base64url')
const me = (api: TestApi, token: string) => supertest(api.app).get('/api/auth/me').set(bearer(token))
const cookieOf = (response: supertest.Response) =>
  ([] as string[]).concat(response.headers['set-cookie'] ?? [])[0]?.split(';')[0] ?? ''

describe('access tokens', () => {
  let api: TestApi
  let user: TestUser
  let claims: { role: string; tv: number }
  const sign = (options: jwt.SignOptions, secret: jwt.Secret = TEST_JWT_SECRET, payload: object = claims) =>
    jwt.sign(payload, secret, { subject: user.user.id, issuer: 'slipway', expiresIn: 600, ...options })

  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
    user = await api.createUser('admin')
    claims = { role: 'admin', tv: 0 }
  })
  afterAll(() => api.close())

  it('accepts a token it signed itself (the control for every case below)', async () => {
    expect((await me(api, sign({ algorithm: 'HS256' }))).status).toBe(200)
  })

  it('refuses an unsigned token (alg "none")', async () => {
    const now = Math.floor(Date.now() / 1000)
    const token = `${b64({ alg: 'none', typ: 'JWT' })}.${b64({ ...claims, sub: user.user.id, iss: 'slipway', iat: now, exp: now + 600 })}.`
    const response = await me(api, token)
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('token_invalid')
  })

  it('refuses HS384 and HS512 tokens made with the right secret: only HS256 is allowed', async () => {
    for (const algorithm of ['HS384', 'HS512'] as const) {
      const response = await me(api, sign({ algorithm }))
      expect(response.status, algorithm).toBe(401)
      expect(response.body.error.code).toBe('token_invalid')
    }
  })

  it('refuses an RS256 token from a key pair of the attacker’s own', async () => {
    const { privateKey } = generateKeyPairSync('rsa', { modulusLength: 2048 })
    const response = await me(api, sign({ algorithm: 'RS256' }, privateKey))
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('token_invalid')
  })

  it('refuses a token signed with another secret, or naming another issuer', async () => {
    expect((await me(api, sign({ algorithm: 'HS256' }, 'another-secret-'.padEnd(48, 'y')))).status).toBe(401)
    expect((await me(api, sign({ algorithm: 'HS256', issuer: 'elsewhere' }))).status).toBe(401)
  })

  it('refuses a token that has expired, with token_expired', async () => {
    const token = sign({ algorithm: 'HS256', expiresIn: -10 })
    const response = await me(api, token)
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('token_expired')
  })

  it('refuses any single-character change to a valid token', async () => {
    const token = sign({ algorithm: 'HS256' })
    await fc.assert(
      fc.asyncProperty(
        fc.nat(token.length - 1),
        fc.constantFrom(...'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_'),
        async (index, char) => {
          fc.pre(token[index] !== char && token[index] !== '.')
          const tampered = token.slice(0, index) + char + token.slice(index + 1)
          // The last character of a base64url segment can carry unused bits: the same bytes decode.
          const sameBytes =
            Buffer.from(tampered.split('.')[2]!, 'base64url').equals(
              Buffer.from(token.split('.')[2]!, 'base64url'),
            ) && tampered.split('.').slice(0, 2).join('.') === token.split('.').slice(0, 2).join('.')
          fc.pre(!sameBytes)
          expect((await me(api, tampered)).status).toBe(401)
        },
      ),
      { numRuns: 30 },
    )
  })

  it('refuses a role raised inside the payload but signed with the old signature', async () => {
    const apprentice = await api.createUser('apprentice')
    const [header, payload, signature] = apprentice.token.split('.')
    const raised = { ...JSON.parse(Buffer.from(payload!, 'base64url').toString()), role: 'admin' }
    const forged = `${header}.${b64(raised)}.${signature}`
    const response = await supertest(api.app).get('/api/admin/users').set(bearer(forged))
    expect(response.status).toBe(401)
  })

  it('refuses a still-unexpired token once the account’s token version moves on or it is deactivated', async () => {
    const victim = await api.createUser('instructor')
    await api.dataSource.getRepository(UserEntity).update({ id: victim.user.id }, { tokenVersion: 1 })
    expect((await me(api, victim.token)).status).toBe(401)
    const other = await api.createUser('instructor')
    await api.dataSource.getRepository(UserEntity).update({ id: other.user.id }, { active: false })
    const response = await me(api, other.token)
    expect(response.status).toBe(401)
    expect(response.body.error.code).toBe('account_inactive')
  })
})

describe('refresh tokens', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api.close())

  it('treats a rotated refresh token presented again after sign-out as reuse', async () => {
    const { email } = await api.createUser('apprentice')
    const { cookie: first } = await api.signIn(email, TEST_PASSWORD)
    const rotated = await supertest(api.app).post('/api/auth/refresh').set('Cookie', first)
    expect(rotated.status).toBe(200)
    const second = cookieOf(rotated)
    await supertest(api.app).post('/api/auth/sign-out').set('Cookie', second)
    const replayed = await supertest(api.app).post('/api/auth/refresh').set('Cookie', second)
    expect(replayed.status).toBe(401)
    expect(replayed.body.error.code).toBe('refresh_token_reused')
  })

  it('refuses a refresh cookie that was never issued', async () => {
    const response = await supertest(api.app)
      .post('/api/auth/refresh')
      .set('Cookie', `slipway_refresh=${'A'.repeat(43)}`)
    expect(response.status).toBe(401)
  })
})

describe('sign-in throttling', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({
      scenarios: false,
      rateLimits: { ...DEFAULT_RATE_LIMITS, signIn: { windowMs: 60_000, limit: 5 } },
    })
  })
  afterAll(() => api.close())

  it('counts attempts per client whatever e-mail they name, then answers 429 with Retry-After', async () => {
    const statuses: number[] = []
    for (let i = 0; i < 7; i++) {
      const response = await supertest(api.app)
        .post('/api/auth/sign-in')
        .send({ email: `guess${i}@slipway.test`, password: 'not-the-password-123' })
      statuses.push(response.status)
      if (response.status === 429) {
        expect(Number(response.headers['retry-after'])).toBeGreaterThan(0)
        expect(response.body.error.code).toMatch(/rate/)
      }
    }
    expect(statuses.slice(0, 5)).toEqual([401, 401, 401, 401, 401])
    expect(statuses.slice(5)).toEqual([429, 429])
  })
})
