// The server's foundation: health, JSON errors for every kind of client mistake, security headers.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { apiErrorSchema, healthResponseSchema } from '../../shared/api'
import { createTestApi, type TestApi } from '../support/api-harness'

describe('server foundation', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api.close())

  it('reports its version and a healthy SQLite database', async () => {
    const response = await api.http.get('/api/health')
    expect(response.status).toBe(200)
    const body = healthResponseSchema.parse(response.body)
    expect(body).toMatchObject({ status: 'ok', database: { ok: true, driver: 'better-sqlite3' } })
    expect(body.version).toMatch(/^\d+\.\d+\.\d+/)
  })

  it('answers an unknown API route with a JSON 404', async () => {
    const response = await api.http.get('/api/no-such-thing')
    expect(response.status).toBe(404)
    expect(apiErrorSchema.parse(response.body).error.code).toBe('route_not_found')
  })

  it('answers malformed JSON with a 400 naming the problem', async () => {
    const response = await api.http
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send('{"email":')
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('invalid_json')
  })

  it('answers a body over the limit with a 413', async () => {
    const response = await api.http
      .post('/api/auth/sign-in')
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ email: 'a@b.test', password: 'x'.repeat(200_000) }))
    expect(response.status).toBe(413)
    expect(response.body.error.code).toBe('payload_too_large')
  })

  it('names each invalid field in a validation error', async () => {
    const response = await api.http.post('/api/auth/sign-in').send({ email: 'not-an-address' })
    expect(response.status).toBe(400)
    expect(response.body.error.code).toBe('validation_failed')
    expect(Object.keys(response.body.error.details.fields).sort()).toEqual(['email', 'password'])
  })

  it('sends a content security policy that allows the app and Pixi workers but nothing foreign', async () => {
    const response = await api.http.get('/api/health')
    const csp = String(response.headers['content-security-policy'])
    expect(csp).toContain("script-src 'self'")
    expect(csp).toContain('worker-src')
    expect(csp).toContain('blob:')
    expect(csp).not.toContain('*')
  })

  it('never leaks a stack trace, even for a malformed id in a path', async () => {
    const { token } = await api.createUser('admin')
    const response = await api.http.get('/api/cohorts/not-a-uuid').set('Authorization', `Bearer ${token}`)
    expect(response.status).toBe(400)
    expect(JSON.stringify(response.body)).not.toMatch(/at .*\.ts:\d+/)
    expect(response.body.error.details.fields).toHaveProperty('id')
  })
})
