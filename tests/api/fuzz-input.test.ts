// Property-based bad input (fast-check): generated malformed bodies, queries, headers, event logs and
// uploads on every route that takes them. The shared zod schemas are the oracle for what is invalid;
// every answer must be a 4xx with a clear error, and the database must be exactly as before.
import { createHash, randomUUID } from 'node:crypto'
import { existsSync, readdirSync } from 'node:fs'
import { join } from 'node:path'
import { parse as parseQuery } from 'node:querystring'
import fc from 'fast-check'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { z } from 'zod'
import * as contract from '../../shared/api'
import { createTestApi, bearer, type TestApi } from '../support/api-harness'
import { snapshotTables } from '../support/test-database'
import { buildWorld, type World } from '../support/world'

// Quick in `npm test`; `npm run test:soak` runs many more cases (FUZZ_RUNS).
const RUNS = Number(process.env.FUZZ_RUNS ?? 20)

const isScheduledOccurrence = (row: unknown) =>
  String((row as { dedupeKey?: unknown }).dedupeKey ?? '').startsWith('schedule:')

/**
 * Every table's rows hashed one table at a time, plus the files kept under DATA_DIR/uploads: a failed
 * comparison then names the table (or the folder) that changed.
 */
async function fingerprint(api: TestApi): Promise<Record<string, string>> {
  const hashOf = (value: unknown) =>
    createHash('sha256').update(JSON.stringify(value)).digest('hex').slice(0, 16)
  const tables: Record<string, string> = {}
  for (const { table, rows } of await snapshotTables(api.dataSource)) {
    // Housekeeping runs by the clock, not by request: a run that spans the hourly upload sweep would
    // otherwise see its queued occurrence run and the next one planned (seen in CI at 12:17).
    tables[table] = hashOf(table === 'jobs' ? rows.filter((row) => !isScheduledOccurrence(row)) : rows)
  }
  const uploads = join(api.dataDir, 'uploads')
  const files = existsSync(uploads) ? readdirSync(uploads).sort() : []
  return { ...tables, 'files in uploads': files.join(', ') }
}

function expectClearClientError(response: supertest.Response, context: unknown) {
  const where = `${response.status} ${response.text.slice(0, 300)} for ${JSON.stringify(context).slice(0, 300)}`
  expect(response.status, where).toBeGreaterThanOrEqual(400)
  expect(response.status, where).toBeLessThan(500)
  expect(response.headers['content-type'], where).toMatch(/application\/json/)
  expect(typeof response.body.error?.code, where).toBe('string')
  expect(response.body.error.message, where).toMatch(/\S{3}/)
}

type Schema = z.ZodType
const keysOf = (schema: Schema): string[] =>
  'shape' in schema && schema.shape && typeof schema.shape === 'object' ? Object.keys(schema.shape) : []

/** Bodies the schema refuses: any JSON at all, or objects with the schema's own keys holding odd values. */
function invalidBodies(schema: Schema) {
  const keys = keysOf(schema)
  const value = fc.oneof(
    fc.jsonValue({ maxDepth: 2 }),
    fc.string({ maxLength: 300 }),
    fc.constantFrom('', ' ', '\u0000', '<script>x</script>', '=1+1', '../../etc/passwd', 'null', '-1e309'),
    fc.double(),
    fc.integer(),
  )
  const shaped = keys.length
    ? fc.dictionary(fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 8 })), value, { maxKeys: 6 })
    : fc.dictionary(fc.string({ maxLength: 8 }), value, { maxKeys: 4 })
  // Judge the body as the server will see it: JSON text turns NaN and ±Infinity into null, which can
  // make an invalid object valid (e.g. a nullable attempt limit).
  return fc
    .oneof(fc.jsonValue({ maxDepth: 3 }), shaped)
    .map((body) => JSON.parse(JSON.stringify(body)) as unknown)
    .filter((body) => !schema.safeParse(body).success)
}

interface BodyRoute {
  method: 'post' | 'put' | 'patch'
  path: (w: World) => string
  schema: Schema
  /** Public routes get no token; the rest run as the admin, who may reach every route. */
  anonymous?: boolean
}

const BODY_ROUTES: BodyRoute[] = [
  { method: 'post', path: () => '/api/auth/sign-in', schema: contract.signInRequestSchema, anonymous: true },
  { method: 'patch', path: () => '/api/auth/me', schema: contract.updateProfileRequestSchema },
  { method: 'post', path: () => '/api/auth/change-password', schema: contract.changePasswordRequestSchema },
  {
    method: 'post',
    path: () => '/api/auth/password-reset',
    schema: contract.passwordResetRequestSchema,
    anonymous: true,
  },
  {
    method: 'post',
    path: () => '/api/auth/password-reset/confirm',
    schema: contract.passwordResetConfirmSchema,
    anonymous: true,
  },
  {
    method: 'post',
    path: () => `/api/invitations/${'x'.repeat(43)}/accept`,
    schema: contract.acceptInvitationRequestSchema,
    anonymous: true,
  },
  { method: 'post', path: () => '/api/cohorts', schema: contract.createCohortRequestSchema },
  {
    method: 'patch',
    path: (w) => `/api/cohorts/${w.cohortA.id}`,
    schema: contract.updateCohortRequestSchema,
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/invitations`,
    schema: contract.inviteRequestSchema,
  },
  {
    method: 'post',
    path: (w) => `/api/cohorts/${w.cohortA.id}/assignments`,
    schema: contract.createAssignmentRequestSchema,
  },
  {
    method: 'patch',
    path: (w) => `/api/assignments/${w.assignmentA.id}`,
    schema: contract.updateAssignmentRequestSchema,
  },
  { method: 'post', path: () => '/api/scenarios/drafts', schema: contract.createDraftRequestSchema },
  {
    method: 'put',
    path: (w) => `/api/scenarios/${w.scenario.key}/draft`,
    schema: contract.saveDraftRequestSchema,
  },
  {
    method: 'put',
    path: (w) => `/api/scenarios/${w.scenario.key}/draft/reference`,
    schema: contract.recordReferenceRequestSchema,
  },
  {
    method: 'post',
    path: (w) => `/api/scenarios/${w.scenario.key}/duplicate`,
    schema: contract.duplicateScenarioRequestSchema,
  },
  { method: 'post', path: () => '/api/attempts', schema: contract.submitAttemptRequestSchema },
  {
    method: 'post',
    path: (w) => `/api/attempts/${w.attemptA1.id}/feedback`,
    schema: contract.feedbackRequestSchema,
  },
  {
    method: 'post',
    path: (w) => `/api/attempts/${w.attemptA1.id}/grade-override`,
    schema: contract.gradeOverrideRequestSchema,
  },
  {
    method: 'patch',
    path: (w) => `/api/admin/users/${w.apprenticeA2.user.id}`,
    schema: contract.updateUserRequestSchema,
  },
  { method: 'post', path: () => '/api/admin/invitations', schema: contract.inviteRequestSchema },
  // Live classroom: an admin may inject and message (the panel's own routes are the apprentice's alone).
  {
    method: 'post',
    path: () => '/api/live/attempts/00000000-0000-4000-8000-0000000011fe/injections',
    schema: contract.injectFaultRequestSchema,
  },
  { method: 'post', path: () => '/api/live/messages', schema: contract.sendLiveMessageRequestSchema },
]

/** Stands in for the world in test titles. */
const PLACEHOLDERS = {
  cohortA: { id: ':id' },
  assignmentA: { id: ':id' },
  attemptA1: { id: ':id' },
  apprenticeA2: { user: { id: ':id' } },
  scenario: { key: ':key' },
} as unknown as World

interface QueryRoute {
  path: (w: World) => string
  schema: Schema
}

const QUERY_ROUTES: QueryRoute[] = [
  { path: () => '/api/cohorts', schema: contract.cohortListQuerySchema },
  { path: () => '/api/assignments', schema: contract.assignmentListQuerySchema },
  { path: () => '/api/attempts', schema: contract.attemptListQuerySchema },
  { path: () => '/api/scenarios', schema: contract.scenarioListQuerySchema },
  { path: () => '/api/admin/users', schema: contract.userListQuerySchema },
  { path: () => '/api/admin/outbox', schema: contract.outboxQuerySchema },
  { path: (w) => `/api/cohorts/${w.cohortA.id}/gradebook`, schema: contract.gradebookQuerySchema },
  { path: (w) => `/api/cohorts/${w.cohortA.id}/gradebook.csv`, schema: contract.gradebookQuerySchema },
]

describe('bad input on every route', () => {
  let api: TestApi
  let world: World
  let before: Record<string, string>

  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    await api.mail()
    before = await fingerprint(api)
  })
  afterAll(async () => {
    // Nothing sent was valid, so nothing may have been stored, changed or mailed.
    await api.mail()
    expect(await fingerprint(api)).toEqual(before)
    await api.close()
  })

  for (const route of BODY_ROUTES) {
    it(`answers malformed bodies on ${route.method.toUpperCase()} ${route.path(PLACEHOLDERS)} with a 4xx naming the problem`, async () => {
      await fc.assert(
        fc.asyncProperty(invalidBodies(route.schema), async (body) => {
          let request = supertest(api.app)[route.method](route.path(world))
          if (!route.anonymous) request = request.set(bearer(world.admin.token))
          // Sent as JSON text: supertest cannot send a bare number or boolean otherwise.
          const response = await request.set('Content-Type', 'application/json').send(JSON.stringify(body))
          expectClearClientError(response, body)
        }),
        { numRuns: RUNS },
      )
      expect(await fingerprint(api)).toEqual(before)
    })
  }

  it('answers bodies that are not JSON, or not the JSON they claim, with 400 or 415', async () => {
    const text = fc.oneof(
      fc.string({ maxLength: 200 }),
      fc.constantFrom('{', '{"name":', '[1,2', 'NaN', '{"t": NaN}', "{'single':'quotes'}", '\u0000', 'null'),
    )
    const contentType = fc.constantFrom(
      'application/json',
      'application/json; charset=utf-8',
      'text/plain',
      'application/x-www-form-urlencoded',
      'application/xml',
      'multipart/form-data; boundary=x',
      'application/json; charset=latin-9',
    )
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...BODY_ROUTES), text, contentType, async (route, raw, type) => {
        let request = supertest(api.app)[route.method](route.path(world)).set('Content-Type', type)
        if (!route.anonymous) request = request.set(bearer(world.admin.token))
        const response = await request.send(raw)
        expectClearClientError(response, { raw, type })
      }),
      { numRuns: RUNS * 3 },
    )
  })

  it('answers every generated query with 200 when the schema takes it and 400 when it does not', async () => {
    for (const route of QUERY_ROUTES) {
      const keys = [...keysOf(route.schema), 'x', '__proto__', 'constructor']
      const value = fc.oneof(
        fc.string({ maxLength: 40 }),
        fc.integer().map(String),
        fc.constantFrom('-1', '0', '1e9', 'NaN', 'true', 'asc', 'desc', 'name', 'average', '%00', ''),
      )
      const pair = fc.tuple(fc.constantFrom(...keys), value)
      await fc.assert(
        fc.asyncProperty(fc.array(pair, { maxLength: 5 }), async (pairs) => {
          const qs = pairs.map(([k, v]) => `${encodeURIComponent(k)}=${encodeURIComponent(v)}`).join('&')
          const response = await supertest(api.app)
            .get(`${route.path(world)}?${qs}`)
            .set(bearer(world.admin.token))
          const valid = route.schema.safeParse({ ...parseQuery(qs) }).success
          if (valid) expect(response.status, `${qs}: ${response.text.slice(0, 200)}`).toBe(200)
          else expectClearClientError(response, qs)
        }),
        { numRuns: RUNS },
      )
    }
  })

  it('answers a malformed or foreign Authorization header with 401 and a token code', async () => {
    const header = fc.oneof(
      fc.string({ maxLength: 120 }),
      fc.string({ maxLength: 80 }).map((s) => `Bearer ${s}`),
      fc.constantFrom(
        'Bearer',
        'Bearer ',
        'Basic YWRtaW46YWRtaW4=',
        'bearer a.b.c',
        'Bearer a.b.c',
        'Bearer ..',
      ),
      fc.base64String({ maxLength: 200 }).map((s) => `Bearer ${s}.${s}.${s}`),
    )
    await fc.assert(
      fc.asyncProperty(
        header,
        fc.constantFrom('/api/auth/me', '/api/cohorts', '/api/attempts'),
        async (h, path) => {
          // Header values must be printable for Node's HTTP client; others cannot be sent at all.
          const printable = h.replace(/[^\x20-\x7e]/g, '')
          const response = await supertest(api.app).get(path).set('Authorization', printable)
          expectClearClientError(response, printable)
          expect(response.status).toBe(401)
          expect(['unauthenticated', 'token_invalid', 'token_expired']).toContain(response.body.error.code)
        },
      ),
      { numRuns: RUNS * 2 },
    )
  })

  it('answers malformed path ids with 400 or 404, never 500', async () => {
    const segment = fc.oneof(
      // Dot-only segments are resolved away by URL normalisation (they name another route, not a bad id).
      fc.string({ minLength: 1, maxLength: 60 }).filter((x) => !/^\.+$/.test(x)),
      fc.uuid().map((u) => u.toUpperCase()),
      fc.constantFrom('%', '%zz', '%2e%2e', 'null', '0', "1' OR '1'='1", 'a'.repeat(500)),
    )
    const template = fc.constantFrom(
      (s: string) => `/api/cohorts/${s}`,
      (s: string) => `/api/cohorts/${s}/gradebook`,
      (s: string) => `/api/attempts/${s}`,
      (s: string) => `/api/assignments/${s}/stats`,
      (s: string) => `/api/scenarios/${s}/versions/${s}`,
      (s: string) => `/api/scenario-versions/${s}`,
      (s: string) => `/api/invitations/${s}`,
    )
    await fc.assert(
      fc.asyncProperty(template, segment, async (path, raw) => {
        // Raw percent signs test bad escapes; ?, # and / would end the path, so they stay encoded.
        const url = path(
          raw.includes('%') ? raw.replace(/[?#/]/g, encodeURIComponent) : encodeURIComponent(raw),
        )
        const response = await supertest(api.app).get(url).set(bearer(world.admin.token))
        expectClearClientError(response, url)
      }),
      { numRuns: RUNS * 2 },
    )
  })
})

describe('bad event logs on attempt submission', () => {
  let api: TestApi
  let world: World
  let before: Record<string, string>
  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    await api.mail()
    before = await fingerprint(api)
  })
  afterAll(async () => {
    await api.mail()
    expect(await fingerprint(api)).toEqual(before)
    await api.close()
  })

  const submit = (events: unknown) =>
    supertest(api.app)
      .post('/api/attempts')
      .set(bearer(world.apprenticeA1.token))
      .send({ id: randomUUID(), assignmentId: world.assignmentA.id, status: 'submitted', events })

  const okEvent = fc.oneof(
    fc.record({ t: fc.nat(100_000), type: fc.constant('power.on') }),
    fc.record({ t: fc.nat(100_000), type: fc.constant('power.off') }),
    fc.record({ t: fc.nat(100_000), type: fc.constant('lock.applied') }),
  )

  it('refuses logs whose times go backwards, naming the event', async () => {
    await fc.assert(
      fc.asyncProperty(fc.array(okEvent, { minLength: 2, maxLength: 30 }), async (events) => {
        const times = events.map((e) => e.t).sort((a, b) => b - a)
        fc.pre(times[0]! > times[times.length - 1]!)
        const descending = events.map((e, i) => ({ ...e, t: times[i]! }))
        const response = await submit(descending)
        expectClearClientError(response, descending)
        expect(response.body.error.code).toBe('validation_failed')
        expect(Object.keys(response.body.error.details.fields).join()).toMatch(/^events\.\d+\.t$/)
      }),
      { numRuns: RUNS },
    )
  })

  it('refuses unknown event types and broken fields (negative, fractional, huge times; null for NaN)', async () => {
    const bad = fc.oneof(
      fc.record({ t: fc.nat(1000), type: fc.string({ maxLength: 20 }).filter((s) => !s.includes('.')) }),
      fc.record({ t: fc.constantFrom(-1, 0.5, 1e300, null, '10', true), type: fc.constant('power.on') }),
      fc.record({ t: fc.nat(1000), type: fc.constant('setting.changed'), key: fc.string(), value: fc.anything() }),
      fc.record({ t: fc.nat(1000), type: fc.constant('device.turned'), device: fc.constant('trim'), position: fc.constantFrom(null, 2, -0.1, 'half') }),
      fc.record({ t: fc.nat(1000), type: fc.constant('wire.added'), id: fc.string(), from: fc.string(), to: fc.string(), colour: fc.string() }),
      fc.jsonValue({ maxDepth: 2 }),
    ) // prettier-ignore
    await fc.assert(
      fc.asyncProperty(fc.array(okEvent, { maxLength: 5 }), bad, async (good, broken) => {
        const events = [...good.sort((a, b) => a.t - b.t), broken]
        fc.pre(!contract.attemptEventLogSchema.safeParse(events).success)
        const response = await submit(events)
        expectClearClientError(response, events)
      }),
      { numRuns: RUNS * 2 },
    )
  })

  it('answers a NaN written into the JSON text with invalid_json', async () => {
    const response = await supertest(api.app)
      .post('/api/attempts')
      .set(bearer(world.apprenticeA1.token))
      .set('Content-Type', 'application/json')
      .send(
        `{"id":"${randomUUID()}","assignmentId":"${world.assignmentA.id}","status":"submitted","events":[{"t":NaN,"type":"power.on"}]}`,
      )
    expectClearClientError(response, 'NaN')
    expect(response.body.error.code).toBe('invalid_json')
  })

  it('answers a log over the body limit with 413 and one over the event cap with 400', async () => {
    const huge = Array.from({ length: 60_000 }, (_, i) => ({
      t: i,
      type: 'meter.probes',
      red: null,
      black: null,
    }))
    const tooBig = await submit(huge)
    expectClearClientError(tooBig, 'huge log')
    expect(tooBig.status).toBe(413)
    // Small events, many of them: within 2 MB but over the 200,000-event cap.
    const many = await supertest(api.app)
      .post('/api/attempts')
      .set(bearer(world.apprenticeA1.token))
      .set('Content-Type', 'application/json')
      .send(
        `{"id":"${randomUUID()}","assignmentId":"${world.assignmentA.id}","status":"submitted","events":[${Array(200_001).fill('1').join(',')}]}`,
      )
    expectClearClientError(many, 'many events')
  })
})

describe('bad uploads', () => {
  let api: TestApi
  let world: World
  let before: Record<string, string>
  beforeAll(async () => {
    api = await createTestApi()
    world = await buildWorld(api)
    await api.mail()
    before = await fingerprint(api)
  })
  afterAll(async () => {
    await api.mail()
    expect(await fingerprint(api)).toEqual(before)
    await api.close()
  })

  const upload = (
    path: string,
    field: string,
    content: string | Buffer,
    filename: string,
    contentType: string,
  ) =>
    supertest(api.app)
      .post(path)
      .set(bearer(world.instructorA.token))
      .attach(field, Buffer.isBuffer(content) ? content : Buffer.from(content), { filename, contentType })

  const roster = () => `/api/cohorts/${world.cohortA.id}/invitations/roster`

  it('refuses generated roster files that are not a valid roster, importing nothing', async () => {
    const content = fc.oneof(
      fc.string({ maxLength: 400 }),
      fc.uint8Array({ maxLength: 400 }).map((a) => Buffer.from(a)),
      fc.constantFrom('name,email\n"unclosed,a@b.example', 'name;email\nA;a@b.example', 'email\n', ',,,\n,,,', 'name,email\nAda,not-an-email'),
      fc.array(fc.tuple(fc.string({ maxLength: 20 }), fc.string({ maxLength: 20 })), { maxLength: 5 })
        .map((rows) => ['name,email', ...rows.map(([n, e]) => `${n},${e}`)].join('\n'))
        .filter((text) => !/^name,email\n[^,\n]+,[^,\n@]+@[^,\n@]+\.[a-z]{2,}$/m.test(text)),
    ) // prettier-ignore
    const type = fc.constantFrom(
      ['roster.csv', 'text/csv'],
      ['roster.txt', 'text/plain'],
      ['roster.html', 'text/html'],
      ['roster.csv', 'image/png'],
    )
    await fc.assert(
      fc.asyncProperty(content, type, async (body, [filename, contentType]) => {
        const response = await upload(roster(), 'roster', body, filename!, contentType!)
        expectClearClientError(response, { body: String(body).slice(0, 80), filename })
      }),
      { numRuns: RUNS * 2 },
    )
  })

  it('refuses a roster whose formula-like cells are not valid people, importing none of it', async () => {
    const cells = ['=cmd|" /C calc"!A0', '+1+1', '-2+3', '@SUM(A1:A9)', '\t=1', '\r=1']
    for (const cell of cells) {
      const response = await upload(
        roster(),
        'roster',
        `name,email\n${cell},${cell}`,
        'roster.csv',
        'text/csv',
      )
      expectClearClientError(response, cell)
      expect(response.body.error.code).toBe('roster_invalid')
    }
  })

  it('refuses oversized, wrongly typed and malformed scenario packs', async () => {
    const path = '/api/scenarios/upload'
    const cases: [string | Buffer, string, string, number][] = [
      // Not JSON at all: the server calls that the wrong kind of file.
      ['{"id": "x"', 'pack.json', 'application/json', 415],
      ['[1, 2, 3]', 'pack.json', 'application/json', 400],
      ['{}', 'pack.json', 'application/json', 400],
      ['<html><script>alert(1)</script></html>', 'pack.html', 'text/html', 415],
      [Buffer.from([0x89, 0x50, 0x4e, 0x47, 0, 0, 0]), 'pack.json', 'application/json', 415],
      ['{"a":"' + 'x'.repeat(600 * 1024) + '"}', 'pack.json', 'application/json', 413],
    ]
    for (const [content, filename, contentType, status] of cases) {
      const response = await upload(path, 'pack', content, filename, contentType)
      expectClearClientError(response, filename)
      expect(response.status, response.text).toBe(status)
    }
    await fc.assert(
      fc.asyncProperty(fc.jsonValue({ maxDepth: 3 }), async (doc) => {
        const response = await upload(path, 'pack', JSON.stringify(doc), 'pack.json', 'application/json')
        expectClearClientError(response, doc)
      }),
      { numRuns: RUNS },
    )
  })
})
