// The hang that kept grading threads off: "a restarted server with a grading thread stopped answering once
// in CI". The built server runs plain JavaScript in every thread (no loader hooks); this starts it with two
// grading threads, submits a graded attempt, stops it (SIGKILL, or SIGTERM every other time) and starts it
// again on the same data folder, twenty times in a row. Every start must answer, every submission must be
// graded, and every acknowledged attempt must still be there at the end.
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'
import { BENCH_PASSWORD, bulkSeed, fixtureLog } from '../bench/bulk-seed'
import { startSlipway, type ServerProcess } from '../support/server-process'

const RESTARTS = 20
const THREADS = '2'

async function signIn(base: string, email: string) {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: BENCH_PASSWORD }),
    signal: AbortSignal.timeout(20_000),
  })
  expect(response.status).toBe(200)
  return ((await response.json()) as { accessToken: string }).accessToken
}

describe(`a built server with grading threads, killed and restarted ${RESTARTS} times`, () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-restarts-'))
  let server: ServerProcess | undefined
  afterAll(async () => {
    await server?.stop('SIGKILL')
    rmSync(dataDir, { recursive: true, force: true })
  })

  it('answers after every start and grades every submission', { timeout: 600_000 }, async () => {
    // A small centre written straight into the database: starts then only open it (no demo seeding).
    const seeded = await bulkSeed(join(dataDir, 'slipway.sqlite'), {
      apprentices: 1,
      cohorts: 1,
      assignmentsPerCohort: 1,
      attempts: 0,
    })
    const email = seeded.apprentices[0]!.email
    const events = fixtureLog('two-wire-run-stop')
    const acknowledged: { id: string; score: number }[] = []
    let scenarioId = ''
    const startTimes: number[] = []
    for (let run = 0; run < RESTARTS; run++) {
      const started = performance.now()
      server = await startSlipway(dataDir, { env: { GRADING_THREADS: THREADS }, timeoutMs: 30_000 })
      startTimes.push(performance.now() - started)
      const ready = await fetch(`${server.url}/api/ready`, { signal: AbortSignal.timeout(10_000) })
      expect(ready.status, `run ${run}: /api/ready`).toBe(200)
      expect(((await ready.json()) as { checks: { grading: object } }).checks.grading).toEqual({
        ok: true,
        threads: 2,
        threadsUp: 2,
      })
      const token = await signIn(server.url, email)
      if (!scenarioId) {
        const list = (await (
          await fetch(`${server.url}/api/scenarios`, { headers: { authorization: `Bearer ${token}` } })
        ).json()) as { items: { id: string; key: string }[] }
        scenarioId = list.items.find((s) => s.key === 'two-wire-run-stop')!.id
      }
      const id = randomUUID()
      const response = await fetch(`${server.url}/api/attempts`, {
        method: 'POST',
        headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
        body: JSON.stringify({ id, scenarioId, status: 'submitted', events }),
        // A hung grading thread shows up here, not as a slow test.
        signal: AbortSignal.timeout(20_000),
      })
      expect(response.status, `run ${run}: submission`).toBe(201)
      acknowledged.push({ id, score: ((await response.json()) as { grade: { score: number } }).grade.score })
      await server.stop(run % 2 ? 'SIGTERM' : 'SIGKILL')
      server = undefined
      console.log(`restart ${run + 1}/${RESTARTS}: up in ${startTimes.at(-1)!.toFixed(0)} ms, graded`)
    }

    server = await startSlipway(dataDir, { env: { GRADING_THREADS: THREADS } })
    const token = await signIn(server.url, email)
    for (const attempt of acknowledged) {
      const response = await fetch(`${server.url}/api/attempts/${attempt.id}`, {
        headers: { authorization: `Bearer ${token}` },
      })
      expect(response.status).toBe(200)
      expect(((await response.json()) as { grade: { score: number } }).grade.score).toBe(attempt.score)
    }
    const later = [...startTimes].sort((a, b) => a - b)
    console.log(
      `restarts: ${RESTARTS} starts with ${THREADS} grading threads, all answered and graded; ` +
        `start to ready ${later[0]!.toFixed(0)}–${later.at(-1)!.toFixed(0)} ms (median ${later[Math.floor(later.length / 2)]!.toFixed(0)} ms)`,
    )
  })
})
