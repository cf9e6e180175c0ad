// SIGTERM under load: ten clients keep submitting graded attempts to the built server; part-way it gets
// SIGTERM. It must finish and acknowledge what was in flight, answer everything that arrives meanwhile with
// a clean 503 (code shutting_down, Retry-After), then stop listening. The clients behave as the app's own
// does (after a 503 they wait Retry-After); none sees a reset connection or any other error, and after a
// restart every acknowledged attempt is there, graded as acknowledged.
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { BENCH_PASSWORD, bulkSeed, fixtureLog, paddedLog } from '../bench/bulk-seed'
import { startSlipway, type ServerProcess } from '../support/server-process'

const CLIENTS = 10
const SIGTERM_AFTER_ACKS = 40

type Outcome =
  | { kind: 'acknowledged'; id: string; score: number; token: string }
  | { kind: 'refused'; status: number; code: string; retryAfter: string | null; connection: string | null }
  | { kind: 'not connected' }
  | { kind: 'failed'; detail: string }

async function signIn(base: string, email: string) {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: BENCH_PASSWORD }),
  })
  if (response.status !== 200) throw new Error(`sign-in ${email}: ${response.status}`)
  return ((await response.json()) as { accessToken: string }).accessToken
}

describe('SIGTERM while submissions are in flight', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-drain-'))
  let server: ServerProcess | undefined
  const outcomes: Outcome[] = []
  let tokens: string[] = []

  beforeAll(async () => {
    // A small centre written straight into the database, so the server starts without seeding a demo.
    const seeded = await bulkSeed(join(dataDir, 'slipway.sqlite'), {
      apprentices: 3,
      cohorts: 1,
      assignmentsPerCohort: 1,
      attempts: 0,
    })
    server = await startSlipway(dataDir)
    tokens = await Promise.all(seeded.apprentices.map((a) => signIn(server!.url, a.email)))
    const list = (await (
      await fetch(`${server.url}/api/scenarios`, { headers: { authorization: `Bearer ${tokens[0]}` } })
    ).json()) as { items: { id: string; key: string }[] }
    const scenarioId = list.items.find((s) => s.key === 'two-wire-run-stop')!.id
    const eventsJson = JSON.stringify(paddedLog(fixtureLog('two-wire-run-stop'), 2000))

    let acks = 0
    let terminated: Promise<void> | undefined
    let closed = false
    const client = async (n: number) => {
      while (!closed) {
        const id = randomUUID()
        const token = tokens[n % tokens.length]!
        try {
          const response = await fetch(`${server!.url}/api/attempts`, {
            method: 'POST',
            headers: {
              'content-type': 'application/json',
              authorization: `Bearer ${tokens[n % tokens.length]}`,
            },
            body: `{"id":"${id}","scenarioId":"${scenarioId}","status":"submitted","events":${eventsJson}}`,
            signal: AbortSignal.timeout(30_000),
          })
          const body = (await response.json()) as { grade?: { score: number }; error?: { code: string } }
          if (response.status === 201) {
            outcomes.push({ kind: 'acknowledged', id, score: body.grade!.score, token })
            if (++acks === SIGTERM_AFTER_ACKS) terminated = server!.stop('SIGTERM')
          } else {
            const retryAfter = response.headers.get('retry-after')
            outcomes.push({
              kind: 'refused',
              status: response.status,
              code: body.error?.code ?? '',
              retryAfter,
              connection: response.headers.get('connection'),
            })
            // As the app's own client does: wait as long as asked before trying again.
            await new Promise((r) => setTimeout(r, Number(retryAfter ?? 1) * 1000))
          }
        } catch (error) {
          const code = (error as { cause?: { code?: string } }).cause?.code
          // The listener has closed: the request never reached the server. Nothing more to send.
          if (code === 'ECONNREFUSED') {
            outcomes.push({ kind: 'not connected' })
            closed = true
          } else outcomes.push({ kind: 'failed', detail: `${(error as Error).message} (${code})` })
        }
      }
    }
    await Promise.all(Array.from({ length: CLIENTS }, (_, n) => client(n)))
    await terminated
    server = await startSlipway(dataDir)
  })

  afterAll(async () => {
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  it('acknowledged or refused every request cleanly while draining: no reset connection, no other error', () => {
    const count = (kind: Outcome['kind']) => outcomes.filter((o) => o.kind === kind).length
    console.log(
      `drain: ${count('acknowledged')} acknowledged, ${count('refused')} answered 503 while draining, ` +
        `${count('not connected')} refused a connection once closed, ${count('failed')} failed`,
    )
    expect(outcomes.filter((o) => o.kind === 'failed')).toEqual([])
    expect(count('acknowledged')).toBeGreaterThanOrEqual(SIGTERM_AFTER_ACKS)
    expect(count('refused')).toBeGreaterThanOrEqual(1)
    for (const o of outcomes) {
      if (o.kind !== 'refused') continue
      expect(o).toMatchObject({ status: 503, code: 'shutting_down', retryAfter: '5', connection: 'close' })
    }
  })

  it('keeps every acknowledged attempt, graded as acknowledged, after the restart', async () => {
    const acknowledged = outcomes.filter((o) => o.kind === 'acknowledged')
    expect(acknowledged.length).toBeGreaterThan(0)
    for (const attempt of acknowledged) {
      const response = await fetch(`${server!.url}/api/attempts/${attempt.id}`, {
        headers: { authorization: `Bearer ${attempt.token}` },
      })
      expect(response.status).toBe(200)
      expect(((await response.json()) as { grade: { score: number } }).grade.score).toBe(attempt.score)
    }
  })
})
