// Two real API processes on different ports against one PostgreSQL database, as behind a load balancer:
// nothing a request needs may live in one process's memory.
import { randomUUID } from 'node:crypto'
import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { createPostgresTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'
import { startServerProcess, type ServerProcess } from '../support/server-process'

const JWT_SECRET = 'scale-test-shared-secret-'.padEnd(48, 'z')
const admin = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor')!
const apprentice = DEMO_ACCOUNTS.find((a) => a.role === 'apprentice')!
const EMPTY_LOG = [{ t: 1000, type: 'attempt.ended' }]

interface Reply {
  status: number
  body: Record<string, unknown>
  cookie?: string
}

async function call(
  server: ServerProcess,
  method: string,
  path: string,
  options: { token?: string; cookie?: string; body?: unknown; forwardedFor?: string } = {},
): Promise<Reply> {
  const headers: Record<string, string> = {}
  if (options.forwardedFor) headers['X-Forwarded-For'] = options.forwardedFor
  if (options.token) headers.Authorization = `Bearer ${options.token}`
  if (options.cookie) headers.Cookie = options.cookie
  if (options.body !== undefined) headers['Content-Type'] = 'application/json'
  const response = await fetch(server.url + path, {
    method,
    headers,
    body: options.body === undefined ? undefined : JSON.stringify(options.body),
  })
  const text = await response.text()
  const cookie = response.headers.getSetCookie().find((c) => c.startsWith('slipway_refresh='))
  return {
    status: response.status,
    body: text ? (JSON.parse(text) as Record<string, unknown>) : {},
    cookie: cookie?.split(';')[0],
  }
}

async function signIn(server: ServerProcess, who: { email: string; password: string }) {
  const reply = await call(server, 'POST', '/api/auth/sign-in', {
    body: { email: who.email, password: who.password },
  })
  expect(reply.status, JSON.stringify(reply.body)).toBe(200)
  return { token: reply.body.accessToken as string, cookie: reply.cookie! }
}

describe.skipIf(!onPostgres)('two API instances sharing one PostgreSQL database', () => {
  let db: TestDatabase
  let a: ServerProcess
  let b: ServerProcess
  let sql: pg.Client

  beforeAll(async () => {
    db = await createPostgresTestDatabase()
    const env = { DATABASE_URL: db.url, JWT_SECRET, PUBLIC_BASE_URL: 'http://slipway.test', DEMO: 'true' }
    // Started together on an empty database: one migrates and seeds while the other waits.
    ;[a, b] = await Promise.all([startServerProcess(env), startServerProcess(env)])
    sql = new pg.Client({ connectionString: db.url })
    await sql.connect()
  })

  afterAll(async () => {
    await sql?.end()
    await Promise.all([a?.stop(), b?.stop()])
    await db?.drop()
  })

  it('runs on different ports, both on PostgreSQL', async () => {
    expect(a.port).not.toBe(b.port)
    for (const server of [a, b]) {
      const health = await call(server, 'GET', '/api/health')
      expect(health.body).toMatchObject({ status: 'ok', database: { ok: true, driver: 'postgres' } })
    }
  })

  it('migrated and seeded once although both started at the same moment', async () => {
    const { rows } = await sql.query('SELECT COUNT(*)::int AS n FROM users WHERE email = $1', [admin.email])
    expect(rows[0].n).toBe(1)
  })

  it('honours on one instance a session started on the other', async () => {
    const session = await signIn(a, apprentice)
    const me = await call(b, 'GET', '/api/auth/me', { token: session.token })
    expect(me.status).toBe(200)
    expect(me.body).toMatchObject({ user: { email: apprentice.email } })
    // The refresh cookie issued by A rotates on B, and B's new cookie rotates back on A.
    const onB = await call(b, 'POST', '/api/auth/refresh', { cookie: session.cookie })
    expect(onB.status).toBe(200)
    const onA = await call(a, 'POST', '/api/auth/refresh', { cookie: onB.cookie })
    expect(onA.status).toBe(200)
  })

  it('rejects on one instance a refresh token revoked on the other', async () => {
    const session = await signIn(a, apprentice)
    const signOut = await call(a, 'POST', '/api/auth/sign-out', { cookie: session.cookie })
    expect(signOut.status).toBeLessThan(300)
    const refresh = await call(b, 'POST', '/api/auth/refresh', { cookie: session.cookie })
    expect(refresh.status).toBe(401)
    expect((refresh.body.error as { code: string }).code).toMatch(/^refresh_token_(reused|invalid)$/)
  })

  it('ends access tokens on one instance when every session is ended on the other', async () => {
    const session = await signIn(a, instructor)
    const everywhere = await call(b, 'POST', '/api/auth/sign-out-everywhere', { token: session.token })
    expect(everywhere.status).toBeLessThan(300)
    const me = await call(a, 'GET', '/api/auth/me', { token: session.token })
    expect(me.status).toBe(401)
  })

  it('stores once the same attempt submitted to both at once', async () => {
    const { token } = await signIn(a, apprentice)
    const scenarios = await call(a, 'GET', '/api/scenarios', { token })
    const scenarioId = (scenarios.body.items as { id: string }[])[0]!.id
    for (let round = 0; round < 5; round++) {
      const body = { id: randomUUID(), scenarioId, status: 'submitted', events: EMPTY_LOG }
      const replies = await Promise.all([
        call(a, 'POST', '/api/attempts', { token, body }),
        call(b, 'POST', '/api/attempts', { token, body }),
      ])
      // One stored it (201); the other handed back the stored result (200), with the same grade.
      expect(replies.map((r) => r.status).sort()).toEqual([200, 201])
      expect(replies[0]!.body.grade).toEqual(replies[1]!.body.grade)
      const attempts = await sql.query('SELECT COUNT(*)::int AS n FROM attempts WHERE id = $1', [body.id])
      expect(attempts.rows[0].n).toBe(1)
      const graded = await sql.query(
        `SELECT COUNT(*)::int AS n FROM audit_entries WHERE "entityId" = $1 AND action = 'grade.graded'`,
        [body.id],
      )
      expect(graded.rows[0].n).toBe(1)
    }
  })

  it("counts one client's requests on both instances against one rate limit", async () => {
    // Password reset allows 5 requests per client per window (server/config.ts DEFAULT_RATE_LIMITS);
    // spread over both instances, a per-process counter would let all six through.
    const statuses: number[] = []
    for (let i = 0; i < 6; i++) {
      const server = i % 2 === 0 ? a : b
      const reply = await call(server, 'POST', '/api/auth/password-reset', {
        body: { email: `nobody-${i}@scale.example` },
      })
      statuses.push(reply.status)
    }
    expect(statuses).toEqual([202, 202, 202, 202, 202, 429])
  })

  it('gives each client forwarded by a loopback proxy its own budget on every instance', async () => {
    // The loopback client above has used its budget; clients behind a proxy are told apart by
    // X-Forwarded-For (TRUST_PROXY defaults to trusting a proxy on loopback).
    const statuses: Record<string, number[]> = { '203.0.113.10': [], '203.0.113.11': [] }
    for (let i = 0; i < 6; i++) {
      for (const client of Object.keys(statuses)) {
        const reply = await call(i % 2 === 0 ? b : a, 'POST', '/api/auth/password-reset', {
          body: { email: `nobody-${i}@scale.example` },
          forwardedFor: client,
        })
        statuses[client]!.push(reply.status)
      }
    }
    expect(statuses['203.0.113.10']).toEqual([202, 202, 202, 202, 202, 429])
    expect(statuses['203.0.113.11']).toEqual([202, 202, 202, 202, 202, 429])
  })

  it('sends each mail once, whichever instance queued it and both claiming from the one queue', async () => {
    const staff = await signIn(a, instructor)
    const cohorts = await call(a, 'GET', '/api/cohorts', { token: staff.token })
    const cohortId = (cohorts.body.items as { id: string }[])[0]!.id
    const run = randomUUID().slice(0, 8)
    const emails = Array.from({ length: 24 }, (_, i) => `scale-${run}-${i}@kestrelvale.example`)
    const invited = await Promise.all(
      emails.map((email, i) =>
        call(i % 2 ? b : a, 'POST', `/api/cohorts/${cohortId}/invitations`, {
          token: staff.token,
          body: { email, name: `Wren Scaletest ${i}` },
        }),
      ),
    )
    expect(invited.map((r) => r.status)).toEqual(emails.map(() => 201))

    const adminSession = await signIn(b, admin)
    let sent = 0
    for (let tries = 0; tries < 100 && sent < emails.length; tries++) {
      const outbox = await call(b, 'GET', `/api/admin/outbox?to=scale-${run}&status=sent&pageSize=100`, {
        token: adminSession.token,
      })
      sent = (outbox.body.items as unknown[]).length
      if (sent < emails.length) await new Promise((r) => setTimeout(r, 100))
    }
    expect(sent).toBe(emails.length)
    // One claim each (a second claim would have counted a second attempt), one message each in the outbox.
    const jobs = await sql.query<{ attempts: number; status: string }>(
      `SELECT "attempts", "status" FROM "jobs" WHERE "kind" = 'mail' AND "label" LIKE $1`,
      [`scale-${run}-%`],
    )
    expect(jobs.rows).toEqual(emails.map(() => ({ attempts: 1, status: 'done' })))
    const received = await sql.query<{ toAddress: string; n: string }>(
      `SELECT "toAddress", COUNT(*) AS n FROM "mail_messages" WHERE "toAddress" LIKE $1 GROUP BY 1`,
      [`scale-${run}-%`],
    )
    expect(received.rows.map((r) => [r.toAddress, Number(r.n)]).sort()).toEqual(
      emails.map((email) => [email, 1]).sort(),
    )
  })
})
