// What operators rely on: readiness, Prometheus metrics and who may read them, a request id on every
// response, error body and log line, a clean 503 when the grading queue is full or the server is draining,
// and a server that keeps answering while a large attempt is graded.
import { randomUUID } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { Writable } from 'node:stream'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { apiErrorSchema, readyResponseSchema } from '../../shared/api'
import type { AttemptEvent } from '../../shared/model'
import { createGradingPool } from '../../server/infrastructure/grading/grading-pool'
import { createLogger } from '../../server/infrastructure/logging'
import { paddedLog } from '../bench/bulk-seed'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { buildWorld, type World } from '../support/world'

const reference = (
  JSON.parse(readFileSync('tests/fixtures/attempts/two-wire-run-stop--reference.json', 'utf8')) as {
    events: AttemptEvent[]
  }
).events
/** About 28,000 events, 1.9 MB of JSON: under every limit, and slow to validate and grade. */
const LARGE_LOG = paddedLog(reference, 28_000)

describe('operations', () => {
  const lines: Record<string, unknown>[] = []
  let api: TestApi
  let w: World

  beforeAll(async () => {
    const destination = new Writable({
      write(chunk: Buffer, _encoding, done) {
        for (const line of chunk.toString().split('\n').filter(Boolean)) lines.push(JSON.parse(line))
        done()
      },
    })
    api = await createTestApi({ log: createLogger('info', destination) })
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  describe('readiness', () => {
    it('is ready when the database answers, every migration is applied and the grading threads are up', async () => {
      await api.grading.warm()
      const response = await api.http.get('/api/ready')
      expect(response.status).toBe(200)
      expect(readyResponseSchema.parse(response.body)).toEqual({
        ready: true,
        checks: {
          database: { ok: true },
          migrations: { ok: true },
          grading: { ok: true, threads: 1, threadsUp: 1 },
          accepting: { ok: true },
        },
      })
    })

    it('is not ready while a migration is pending', async () => {
      const [last] = await api.dataSource.query('SELECT * FROM "migrations" ORDER BY "id" DESC LIMIT 1')
      // The query builder writes each driver's placeholders (? on SQLite, $1 on PostgreSQL: test:pg runs this too).
      const migrations = () => api.dataSource.createQueryBuilder()
      await migrations().delete().from('migrations').where('id = :id', { id: last.id }).execute()
      try {
        const response = await api.http.get('/api/ready')
        expect(response.status).toBe(503)
        expect(response.body.checks.migrations).toEqual({ ok: false })
        // Liveness is another matter: the process is up and the database answers.
        expect((await api.http.get('/api/health')).status).toBe(200)
      } finally {
        await migrations()
          .insert()
          .into('migrations')
          .values({ id: last.id, timestamp: last.timestamp, name: last.name })
          .execute()
      }
    })
  })

  describe('metrics', () => {
    it('serves Prometheus text to a scraper on this machine, with request latency by route template', async () => {
      await api.http.get(`/api/attempts/${w.attemptA1.id}`).set(bearer(w.apprenticeA1.token)).expect(200)
      const response = await api.http.get('/api/metrics')
      expect(response.status).toBe(200)
      expect(response.headers['content-type']).toMatch(/^text\/plain/)
      const text = response.text
      expect(text).toMatch(
        /slipway_http_request_duration_seconds_count\{method="GET",route="\/api\/attempts\/:id",status="200"\} [1-9]/,
      )
      expect(text).toMatch(
        /slipway_http_request_duration_seconds_count\{method="POST",route="\/api\/attempts",status="201"\} [1-9]/,
      )
      expect(text).toMatch(/^slipway_grading_queue_depth 0$/m)
      expect(text).toMatch(/^slipway_grading_threads 1$/m)
      expect(text).toMatch(/slipway_grading_task_duration_seconds_count\{task="grade",outcome="ok"\} [1-9]/)
      // No request path with an id in it becomes a label of its own.
      expect(text).not.toContain(w.attemptA1.id)
    })

    it('refuses a request that came through a reverse proxy, even one on this machine', async () => {
      const response = await api.http.get('/api/metrics').set('X-Forwarded-For', '203.0.113.9')
      expect(response.status).toBe(403)
      expect(apiErrorSchema.parse(response.body).error.code).toBe('forbidden')
    })

    it('with METRICS_TOKEN, answers only the bearer of that token', async () => {
      const token = 'scrape-token-0123456789abcdef'
      const guarded = await createTestApi({ scenarios: false, config: { metricsToken: token } })
      try {
        expect((await guarded.http.get('/api/metrics')).status).toBe(403)
        expect(
          (await guarded.http.get('/api/metrics').set(bearer('wrong-token-0123456789abcdef'))).status,
        ).toBe(403)
        const allowed = await guarded.http
          .get('/api/metrics')
          .set(bearer(token))
          .set('X-Forwarded-For', '203.0.113.9')
        expect(allowed.status).toBe(200)
        expect(allowed.text).toContain('slipway_http_request_duration_seconds')
      } finally {
        await guarded.close()
      }
    })
  })

  describe('request ids', () => {
    it('answers every request with an X-Request-Id, and an error body carries the same one', async () => {
      const ok = await api.http.get('/api/health')
      expect(ok.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/)
      const missing = await api.http.get('/api/no-such-route')
      const body = apiErrorSchema.parse(missing.body)
      expect(body.error.requestId).toBe(missing.headers['x-request-id'])
      expect(missing.headers['x-request-id']).not.toBe(ok.headers['x-request-id'])
    })

    it("keeps a proxy's X-Request-Id when it is a plain token, and replaces anything else", async () => {
      const kept = await api.http.get('/api/no-such-route').set('X-Request-Id', 'edge-7f3a9c1d2e')
      expect(kept.headers['x-request-id']).toBe('edge-7f3a9c1d2e')
      expect(kept.body.error.requestId).toBe('edge-7f3a9c1d2e')
      const replaced = await api.http.get('/api/health').set('X-Request-Id', 'bad id <script>')
      expect(replaced.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/)
    })

    it('puts the request id in every log line written while the request is handled', async () => {
      lines.length = 0
      const response = await api.http
        .post('/api/attempts')
        .set(bearer(w.apprenticeA1.token))
        .set('Content-Type', 'application/json')
        .send('{"id": "not json')
      expect(response.status).toBe(400)
      const requestId = response.headers['x-request-id']
      const about = lines.filter((l) => l.requestId === requestId)
      expect(about.length).toBeGreaterThanOrEqual(1)
      expect(about.some((l) => l.msg === 'request completed' || l.msg === 'request errored')).toBe(true)
    })

    it('puts it also in a line the process logger writes while handling the request', async () => {
      lines.length = 0
      const query = api.dataSource.query.bind(api.dataSource)
      api.dataSource.query = async () => {
        throw new Error('the database went away')
      }
      try {
        const response = await api.http.get('/api/health')
        expect(response.status).toBe(503)
        const line = lines.find((l) => l.msg === 'health check: database did not answer')
        expect(line?.requestId).toBe(response.headers['x-request-id'])
      } finally {
        api.dataSource.query = query
      }
    })
  })

  describe('a full grading queue', () => {
    it('answers 503 with Retry-After, stores nothing it refused, and keeps everything it acknowledged', async () => {
      const small = await createTestApi({ grading: createGradingPool({ threads: 1, queueLimit: 1 }) })
      try {
        const world = await buildWorld(small)
        await small.grading.warm()
        const ids = Array.from({ length: 8 }, () => randomUUID())
        const responses = await Promise.all(
          ids.map((id) =>
            supertest(small.app)
              .post('/api/attempts')
              .set(bearer(world.apprenticeA1.token))
              .send({ id, scenarioId: world.scenario.id, status: 'submitted', events: LARGE_LOG }),
          ),
        )
        const refused = responses.filter((r) => r.status === 503)
        const stored = responses.filter((r) => r.status === 201)
        expect(refused.length + stored.length).toBe(ids.length)
        expect(refused.length).toBeGreaterThanOrEqual(1)
        expect(stored.length).toBeGreaterThanOrEqual(1)
        for (const r of refused) {
          expect(Number(r.headers['retry-after'])).toBeGreaterThanOrEqual(1)
          const body = apiErrorSchema.parse(r.body)
          expect(body.error.code).toBe('server_busy')
          expect(body.error.requestId).toBe(r.headers['x-request-id'])
        }
        for (const [i, r] of responses.entries()) {
          const read = await supertest(small.app)
            .get(`/api/attempts/${ids[i]}`)
            .set(bearer(world.apprenticeA1.token))
          expect(read.status).toBe(r.status === 201 ? 200 : 404)
        }
        // Sent again once the queue has room (Retry-After), a refused attempt is stored.
        const retried = await supertest(small.app)
          .post('/api/attempts')
          .set(bearer(world.apprenticeA1.token))
          .send({
            id: ids[responses.indexOf(refused[0]!)],
            scenarioId: world.scenario.id,
            status: 'submitted',
            events: LARGE_LOG,
          })
        expect(retried.status).toBe(201)
      } finally {
        await small.close()
      }
    })
  })

  describe('the event loop while a large attempt grades', () => {
    it('answers /api/health before a 1.9 MB attempt has finished grading', async () => {
      const body = JSON.stringify({
        id: randomUUID(),
        scenarioId: w.scenario.id,
        status: 'submitted',
        events: LARGE_LOG,
      })
      expect(body.length).toBeGreaterThan(1_800_000)
      expect(body.length).toBeLessThan(2 * 1024 * 1024)
      const order: string[] = []
      const sent = performance.now()
      const submission = supertest(api.app)
        .post('/api/attempts')
        .set(bearer(w.apprenticeA2.token))
        .set('Content-Type', 'application/json')
        .send(body)
        .then((r) => {
          order.push('submission')
          return { r, ms: performance.now() - sent }
        })
      // Give the body time to arrive and reach a grading thread.
      await new Promise((r) => setTimeout(r, 150))
      const asked = performance.now()
      const health = await api.http.get('/api/health')
      const healthMs = performance.now() - asked
      order.push('health')
      expect(health.status).toBe(200)
      const submitted = await submission
      expect(submitted.r.status).toBe(201)
      expect(submitted.r.body.eventCount).toBe(LARGE_LOG.length)
      expect(order).toEqual(['health', 'submission'])
      // Graded on the event loop, health would wait for the parse, validation and replay to finish.
      expect(healthMs).toBeLessThan(submitted.ms / 2)
    })
  })

  describe('draining for a shutdown', () => {
    it('answers new requests with a clean 503 and Retry-After, and reports not ready', async () => {
      const draining = await createTestApi({ scenarios: false })
      try {
        expect(await draining.lifecycle.drain(1000)).toBe(true)
        const refused = await draining.http.get('/api/scenarios')
        expect(refused.status).toBe(503)
        expect(refused.headers['retry-after']).toBe('5')
        expect(refused.headers.connection).toBe('close')
        expect(apiErrorSchema.parse(refused.body).error.code).toBe('shutting_down')
        const ready = await draining.http.get('/api/ready')
        expect(ready.status).toBe(503)
        expect(ready.body.checks.accepting).toEqual({ ok: false })
        expect((await draining.http.get('/api/health')).status).toBe(200)
      } finally {
        await draining.close()
      }
    })
  })
})
