// One port in production: the built client with an SPA fallback, while /api stays JSON.
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { loadConfig } from '../../server/config'
import { createTestApi, type TestApi } from '../support/api-harness'

describe('serving the built client', () => {
  let api: TestApi
  let clientDir: string
  beforeAll(async () => {
    clientDir = mkdtempSync(join(tmpdir(), 'slipway-client-'))
    mkdirSync(join(clientDir, 'assets'))
    writeFileSync(join(clientDir, 'index.html'), '<!doctype html><title>Slipway test shell</title>')
    writeFileSync(join(clientDir, 'assets', 'app-abc123.js'), 'console.log("app")')
    api = await createTestApi({ scenarios: false, clientDir, config: { serveClient: true } })
  })
  afterAll(async () => {
    await api.close()
    rmSync(clientDir, { recursive: true, force: true })
  })

  it('serves static assets', async () => {
    const response = await api.http.get('/assets/app-abc123.js')
    expect(response.status).toBe(200)
    expect(response.text).toContain('console.log')
  })

  it('answers a deep link with index.html so the client router can take over', async () => {
    const response = await api.http.get('/cohorts/123/gradebook').set('Accept', 'text/html')
    expect(response.status).toBe(200)
    expect(response.text).toContain('Slipway test shell')
    expect(response.headers['cache-control']).toBe('no-cache')
  })

  it('keeps unknown API routes as JSON 404s, not the page', async () => {
    const response = await api.http.get('/api/nothing-here').set('Accept', 'text/html')
    expect(response.status).toBe(404)
    expect(response.body.error.code).toBe('route_not_found')
  })

  it('does not invent a page for a missing asset', async () => {
    const response = await api.http.get('/assets/missing.js').set('Accept', 'application/javascript')
    expect(response.status).toBe(404)
  })
})

describe('configuration from the environment', () => {
  it('defaults to port 3000 in production and 3001 for the API alone in development', () => {
    expect(loadConfig({ NODE_ENV: 'production' }).port).toBe(3000)
    expect(loadConfig({ NODE_ENV: 'production', PORT: '4100' }).port).toBe(4100)
    expect(loadConfig({}).port).toBe(3001)
    expect(loadConfig({ API_PORT: '3999', PORT: '4100' }).port).toBe(3999)
  })

  it('serves the client in production unless SERVE_CLIENT=false', () => {
    expect(loadConfig({ NODE_ENV: 'production' }).serveClient).toBe(true)
    expect(loadConfig({ NODE_ENV: 'production', SERVE_CLIENT: 'false' }).serveClient).toBe(false)
    expect(loadConfig({}).serveClient).toBe(false)
  })

  it('takes a SQLite DATABASE_URL and SMTP settings for a real relay', () => {
    const config = loadConfig({
      DATABASE_URL: 'sqlite:/tmp/elsewhere.sqlite',
      SMTP_HOST: 'relay.example',
      SMTP_PORT: '2525',
    })
    expect(config.databasePath).toBe('/tmp/elsewhere.sqlite')
    expect(config.smtp).toMatchObject({ host: 'relay.example', port: 2525 })
  })

  it('names a bad value and the variable it came from', () => {
    expect(() => loadConfig({ PORT: 'eighty' })).toThrow(/PORT/)
    expect(() => loadConfig({ JWT_SECRET: 'short' })).toThrow(/JWT_SECRET must be at least 32 characters/)
  })

  it('uses the OWASP argon2id parameters unless a caller overrides them', () => {
    // OWASP Password Storage Cheat Sheet: argon2id, m = 19 MiB, t = 2, p = 1.
    expect(loadConfig({}).passwordHashing).toEqual({ memoryCost: 19 * 1024, timeCost: 2, parallelism: 1 })
  })
})
