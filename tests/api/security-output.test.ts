// What the server sends back: helmet's headers on every kind of response, uploaded files never served
// back (least of all as HTML), and CSV exports with formula cells neutralised (OWASP "CSV Injection").
import { randomUUID } from 'node:crypto'
import { mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { parse } from 'csv-parse/sync'
import fc from 'fast-check'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { EnrollmentEntity, UserEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { createCohort, type World, buildWorld } from '../support/world'

describe('response headers and uploaded files', () => {
  let api: TestApi
  let world: World
  let clientDir: string
  beforeAll(async () => {
    clientDir = mkdtempSync(join(tmpdir(), 'slipway-client-'))
    mkdirSync(join(clientDir, 'assets'))
    writeFileSync(join(clientDir, 'index.html'), '<!doctype html><title>Slipway shell</title>')
    writeFileSync(join(clientDir, 'assets', 'app-abc123.js'), 'console.log("app")')
    api = await createTestApi({ clientDir, config: { serveClient: true } })
    world = await buildWorld(api)
  })
  afterAll(async () => {
    await api.close()
    rmSync(clientDir, { recursive: true, force: true })
  })

  // helmet 8 defaults (helmetjs.github.io), plus the policy set in server/app.ts.
  const EXPECTED: Record<string, RegExp> = {
    'content-security-policy': /default-src 'self'.*frame-ancestors 'none'/,
    'x-content-type-options': /^nosniff$/,
    'x-frame-options': /^SAMEORIGIN$/,
    'strict-transport-security': /max-age=\d+/,
    'referrer-policy': /^no-referrer$/,
    'cross-origin-opener-policy': /^same-origin$/,
    'cross-origin-resource-policy': /^same-origin$/,
    'x-dns-prefetch-control': /^off$/,
    'x-download-options': /^noopen$/,
    'x-permitted-cross-domain-policies': /^none$/,
  }

  it('sends the security headers on JSON, errors, CSV, static files and the page', async () => {
    const responses = [
      await supertest(api.app).get('/api/health'),
      await supertest(api.app).get('/api/no-such-route'),
      await supertest(api.app).post('/api/auth/sign-in').set('Content-Type', 'application/json').send('{'),
      await supertest(api.app)
        .get(`/api/cohorts/${world.cohortA.id}/gradebook.csv`)
        .set(bearer(world.instructorA.token)),
      await supertest(api.app).get('/assets/app-abc123.js'),
      await supertest(api.app).get('/cohorts/anything').set('Accept', 'text/html'),
    ]
    for (const [index, response] of responses.entries()) {
      for (const [name, pattern] of Object.entries(EXPECTED)) {
        expect(response.headers[name], `${name} on response ${index}`).toMatch(pattern)
      }
      expect(response.headers['x-powered-by']).toBeUndefined()
    }
  })

  it('keeps an uploaded pack out of reach: never served back, and never as HTML', async () => {
    const marker = `upload-marker-${randomUUID()}`
    const pack = `{"note":"<html><body><script>alert('${marker}')</script></body></html>"}`
    // The pack is refused as a scenario, but even a refused file must not become a page.
    await supertest(api.app)
      .post('/api/scenarios/upload')
      .set(bearer(world.instructorA.token))
      .attach('pack', Buffer.from(pack), { filename: 'evil.html.json', contentType: 'text/html' })
    const good = JSON.parse(readFileSync('scenarios/two-wire-run-stop.json', 'utf8'))
    const stored = await supertest(api.app)
      .post('/api/scenarios/upload')
      .set(bearer(world.instructorA.token))
      .attach(
        'pack',
        Buffer.from(JSON.stringify({ ...good, id: 'uploaded-copy', title: `<b>${marker}</b>` })),
        {
          filename: 'pack.json',
          contentType: 'application/json',
        },
      )
    expect(stored.status, stored.text).toBe(201)
    const kept = readdirSync(join(api.dataDir, 'uploads'), { withFileTypes: true })
      .filter((entry) => entry.isFile()) // not the staging folder, empty once the upload committed
      .map((entry) => entry.name)
    expect(kept.length).toBeGreaterThan(0)
    for (const name of kept) {
      expect(name).toMatch(/^[0-9a-f-]{36}\.json$/)
      for (const path of [`/uploads/${name}`, `/api/uploads/${name}`, `/${name}`, `/assets/${name}`]) {
        const response = await supertest(api.app)
          .get(path)
          .set(bearer(world.admin.token))
          .set('Accept', '*/*')
        expect(response.text, path).not.toContain(marker)
      }
    }
    // Where the uploaded text does come back (the draft it became: a bare document has no reference solution),
    // it is JSON that browsers must not sniff.
    const read = await supertest(api.app)
      .get('/api/scenarios/uploaded-copy/draft')
      .set(bearer(world.admin.token))
    expect(read.status).toBe(200)
    expect(read.text).toContain(marker)
    expect(read.headers['content-type']).toMatch(/^application\/json/)
    expect(read.headers['x-content-type-options']).toBe('nosniff')
  })
})

describe('CSV export', () => {
  let api: TestApi
  beforeAll(async () => {
    api = await createTestApi({ scenarios: false })
  })
  afterAll(() => api.close())

  const DANGEROUS = /^[=+\-@\t\r]/

  it('neutralises every cell that starts with =, +, -, @, tab or carriage return, and keeps the rest as is', async () => {
    const instructor = await api.createUser('instructor')
    const cohort = await createCohort(api, instructor, 'Export cohort', [])
    const name = fc.oneof(
      fc
        .tuple(fc.constantFrom('=', '+', '-', '@', '\t', '\r'), fc.string({ maxLength: 30 }))
        .map(([a, b]) => a + b),
      fc.constantFrom(
        '=HYPERLINK("http://x.example","go")',
        '+SUM(1,2)',
        '-2+3',
        '@cmd',
        '=cmd|" /C calc"!A0',
      ),
      fc.string({ minLength: 1, maxLength: 30 }),
    )
    await fc.assert(
      fc.asyncProperty(fc.uniqueArray(name, { minLength: 1, maxLength: 8 }), async (names) => {
        const now = new Date().toISOString()
        const ids: string[] = []
        for (const n of names) {
          const id = randomUUID()
          ids.push(id)
          await api.dataSource.getRepository(UserEntity).insert({
            id, email: `${id.slice(0, 8)}@export.example`, name: n, role: 'apprentice', passwordHash: 'x',
            active: true, tokenVersion: 0, createdAt: now, updatedAt: now, lastSignInAt: null,
          }) // prettier-ignore
          await api.dataSource
            .getRepository(EnrollmentEntity)
            .insert({ id: randomUUID(), cohortId: cohort.id, userId: id, createdAt: now })
        }
        const response = await supertest(api.app)
          .get(`/api/cohorts/${cohort.id}/gradebook.csv`)
          .set(bearer(instructor.token))
        expect(response.status).toBe(200)
        // csv-parse, not our own code, reads the file back as a spreadsheet would see its cells.
        const records: string[][] = parse(response.text.replace(/^\uFEFF/, ''), { relax_column_count: true })
        for (const n of names) {
          const row = records.find((r) => r[0] === n || r[0] === `'${n}`)
          expect(row, JSON.stringify(n)).toBeDefined()
          expect(row![0]).toBe(DANGEROUS.test(n) ? `'${n}` : n)
        }
        for (const cell of records.flat()) expect(cell).not.toMatch(DANGEROUS)
        await api.dataSource.getRepository(EnrollmentEntity).delete({ cohortId: cohort.id })
        for (const id of ids) await api.dataSource.getRepository(UserEntity).delete({ id })
      }),
      { numRuns: 15 },
    )
  })
})
