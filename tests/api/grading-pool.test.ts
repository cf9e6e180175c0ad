// Grading threads: they read a submission body exactly as express.json and the shared schema would (same
// 400s), grade every reference and mistake log in the fixtures exactly as the grader does on the calling
// thread, report an unreplayable log as the same client error, and refuse work with 503 when the queue is full.
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { submitAttemptRequestSchema } from '../../shared/api/attempts'
import type { AttemptEvent } from '../../shared/model'
import type { Scenario } from '../../shared/scenario/schema'
import { HttpError, zodDetails } from '../../server/http-error'
import { createGradingPool, type GradingPool } from '../../server/infrastructure/grading/grading-pool'
import { gradeAttempt } from '../../server/infrastructure/grading/grading'
import { paddedLog } from '../bench/bulk-seed'

const FIXTURES = new URL('../fixtures/attempts/', import.meta.url)
const SCENARIOS = new URL('../../scenarios/', import.meta.url)

interface Fixture {
  scenario: string
  events: AttemptEvent[]
}

const fixtures = readdirSync(FIXTURES)
  .filter((f) => f.endsWith('.json'))
  .map((file) => ({ file, ...(JSON.parse(readFileSync(new URL(file, FIXTURES), 'utf8')) as Fixture) }))
const documents = new Map<string, string>()
const documentOf = (key: string) => {
  if (!documents.has(key)) documents.set(key, readFileSync(new URL(`${key}.json`, SCENARIOS), 'utf8'))
  return documents.get(key)!
}
const bytes = (text: string) => new TextEncoder().encode(text)

describe('grading pool', () => {
  let pool: GradingPool

  beforeAll(async () => {
    // Room for every fixture at once (the default, 16 a thread, is what a server uses).
    pool = createGradingPool({ threads: 2, queueLimit: 128 })
    await pool.warm()
  })
  afterAll(() => pool.close())

  it('runs the threads it was asked for', () => {
    expect(pool.stats()).toMatchObject({ threads: 2, threadsUp: 2, queued: 0 })
  })

  it('grades every fixture log in threads exactly as on the calling thread', async () => {
    expect(fixtures.length).toBeGreaterThan(10)
    const inThreads = await Promise.all(
      fixtures.map((f) =>
        pool.grade({ id: f.scenario, document: documentOf(f.scenario) }, JSON.stringify(f.events)),
      ),
    )
    fixtures.forEach((f, i) => {
      const inline = gradeAttempt(JSON.parse(documentOf(f.scenario)) as Scenario, f.events)
      const { score, passed, evidenceJson } = inThreads[i]!
      expect({ score, passed, evidence: JSON.parse(evidenceJson) }, f.file).toEqual(
        JSON.parse(JSON.stringify(inline)),
      )
    })
  })

  it('reports a log it cannot replay as the 400 inline grading gives', async () => {
    const f = fixtures[0]!
    // Valid events for the schema, but a device the scenario does not have.
    const events: AttemptEvent[] = [{ t: 0, type: 'device.pressed', device: 'noSuchDevice' }]
    const scenario = JSON.parse(documentOf(f.scenario)) as Scenario
    const inline = (() => {
      try {
        gradeAttempt(scenario, events)
      } catch (error) {
        return error as HttpError
      }
    })()
    const inThread = await pool
      .grade({ id: f.scenario, document: documentOf(f.scenario) }, JSON.stringify(events))
      .catch((error: unknown) => error)
    if (inline) {
      expect(inThread).toBeInstanceOf(HttpError)
      expect(inThread).toMatchObject({ status: 400, code: inline.code, message: inline.message })
    } else {
      // The model ignores the unknown device without throwing: threads must agree.
      expect(inThread).not.toBeInstanceOf(Error)
    }
  })

  describe('reading a submission body', () => {
    const scenarioId = randomUUID()
    const events = fixtures[0]!.events

    it('returns the validated request and the log as the row stores it', async () => {
      const id = randomUUID()
      const read = await pool.read(bytes(JSON.stringify({ id, scenarioId, status: 'submitted', events })))
      expect(read.request).toEqual({ id, scenarioId, status: 'submitted' })
      const parsed = submitAttemptRequestSchema.parse({ id, scenarioId, status: 'submitted', events })
      expect(read.eventsJson).toBe(JSON.stringify(parsed.events))
      expect(read.eventCount).toBe(events.length)
      expect(read.hintRevealed).toBe(events.some((e) => e.type === 'hint.revealed'))
    })

    it('drops fields the schema does not know, as validate() does', async () => {
      const withExtra = events.map((e) => ({ ...e, colourOfSky: 'blue' }))
      const read = await pool.read(
        bytes(JSON.stringify({ id: randomUUID(), scenarioId, status: 'inProgress', events: withExtra })),
      )
      expect(read.eventsJson).toBe(JSON.stringify(events))
    })

    it('gives the schema’s own field messages for an invalid body', async () => {
      const body = { id: 'not-a-uuid', status: 'finished', events: [{ t: -1, type: 'power.on' }] }
      const error = await pool.read(bytes(JSON.stringify(body))).catch((e: unknown) => e)
      const expected = submitAttemptRequestSchema.safeParse(body)
      expect(expected.success).toBe(false)
      expect(error).toBeInstanceOf(HttpError)
      expect(error).toMatchObject({
        status: 400,
        code: 'validation_failed',
        message: 'Some fields are not valid',
        details: zodDetails(expected.error!),
      })
    })

    it('reads no body, or an empty one, as {} (every field missing)', async () => {
      for (const body of [null, bytes('  ')]) {
        const error = await pool.read(body).catch((e: unknown) => e)
        expect(error).toMatchObject({ status: 400, code: 'validation_failed' })
        expect(Object.keys((error as HttpError & { details: { fields: object } }).details.fields)).toEqual(
          expect.arrayContaining(['id', 'status', 'events']),
        )
      }
    })

    it('answers invalid_json for text that is not JSON, or not an object or array', async () => {
      for (const text of ['{"id": ', '{"t": NaN}', '"just a string"', '42']) {
        const error = await pool.read(bytes(text)).catch((e: unknown) => e)
        expect(error, text).toMatchObject({ status: 400, code: 'invalid_json' })
      }
    })
  })

  it('refuses with 503 and Retry-After when its queue is full, and finishes what it accepted', async () => {
    const small = createGradingPool({ threads: 1, queueLimit: 1 })
    try {
      await small.warm()
      const f = fixtures.find((x) => x.scenario === 'raise-lower-commissioning') ?? fixtures[0]!
      const long = JSON.stringify(paddedLog(f.events, 10_000))
      const scenario = { id: f.scenario, document: documentOf(f.scenario) }
      const outcomes = await Promise.allSettled(Array.from({ length: 6 }, () => small.grade(scenario, long)))
      const refused = outcomes.filter((o) => o.status === 'rejected')
      const graded = outcomes.filter((o) => o.status === 'fulfilled')
      // One running, one waiting; the others are refused at once.
      expect(graded.length).toBeGreaterThanOrEqual(1)
      expect(graded.length).toBeLessThanOrEqual(2)
      expect(refused.length).toBe(6 - graded.length)
      for (const r of refused) {
        const error = (r as PromiseRejectedResult).reason as HttpError
        expect(error).toBeInstanceOf(HttpError)
        expect(error.status).toBe(503)
        expect(error.code).toBe('server_busy')
        expect(Number(error.headers?.['Retry-After'])).toBeGreaterThanOrEqual(1)
      }
      const expected = gradeAttempt(JSON.parse(scenario.document) as Scenario, JSON.parse(long))
      for (const g of graded) {
        expect((g as PromiseFulfilledResult<{ score: number }>).value.score).toBe(expected.score)
      }
    } finally {
      await small.close()
    }
  })
})
