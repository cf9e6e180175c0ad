// Grading threads give exactly the result the grader gives on the calling thread, for every reference and
// mistake log in the fixtures, and report an unreplayable log as the same client error.
import { readdirSync, readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { AttemptEvent } from '../../shared/model'
import type { Scenario } from '../../shared/scenario/schema'
import { HttpError } from '../../server/http-error'
import { createGradingPool, type GradingPool } from '../../server/infrastructure/grading/grading-pool'
import { gradeAttempt } from '../../server/infrastructure/grading/grading'

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

const logOf = (events: AttemptEvent[]) => ({ events, json: JSON.stringify(events) })

describe('grading pool', () => {
  let pool: GradingPool

  beforeAll(() => {
    // Real worker threads, loading TypeScript the way every start script does (tsx, this repo's paths).
    process.env.TSX_TSCONFIG_PATH ??= 'tsconfig.node.json'
    pool = createGradingPool({ threads: 2, execArgv: ['--import', 'tsx'] })
  })
  afterAll(() => pool.close())

  it('grades every fixture log in threads exactly as on the calling thread', async () => {
    expect(fixtures.length).toBeGreaterThan(10)
    const inThreads = await Promise.all(
      fixtures.map((f) => pool.grade({ id: f.scenario, document: documentOf(f.scenario) }, logOf(f.events))),
    )
    fixtures.forEach((f, i) => {
      const inline = gradeAttempt(JSON.parse(documentOf(f.scenario)) as Scenario, f.events)
      expect(inThreads[i], f.file).toEqual(inline)
    })
  })

  it('reports a log it cannot replay (time running backwards) as a 400, as inline grading does', async () => {
    const f = fixtures[0]!
    const events: AttemptEvent[] = [
      { t: 2000, type: 'attempt.ended' },
      { t: 1000, type: 'attempt.ended' },
    ]
    const attempt = pool.grade({ id: f.scenario, document: documentOf(f.scenario) }, logOf(events))
    await expect(attempt).rejects.toBeInstanceOf(HttpError)
    await expect(attempt).rejects.toMatchObject({ status: 400 })
    const inline = createGradingPool({ threads: 0 }).grade(
      { id: f.scenario, document: documentOf(f.scenario) },
      logOf(events),
    )
    await expect(inline).rejects.toMatchObject({
      status: 400,
      message: (await attempt.catch((e) => e)).message,
    })
  })
})
