// API benchmark: autocannon on loopback against the production server (child process) on a database
// seeded with 500 apprentices, 40 assignments and 20,000 attempts, with a bare Express route as the
// baseline in the same run. Run alone: npx tsx --tsconfig tsconfig.node.json tests/bench/api.bench.ts
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import autocannon from 'autocannon'
import { BENCH_PASSWORD, bulkSeed, fixtureLog, ISSUE_SHAPE, paddedLog } from './bulk-seed'
import { startBareExpress, startSlipway } from '../support/server-process'
import { formatTable, type BenchRow } from './table'

export interface LoadFigures {
  name: string
  connections: number
  requestsPerSecond: number
  p50: number
  p99: number
  total: number
  /** Responses that were not 2xx, plus socket errors and timeouts: must be 0 for the figure to count. */
  failures: number
}

const DURATION_S = Number(process.env.BENCH_API_SECONDS ?? 8)

async function load(
  name: string,
  url: string,
  connections: number,
  request: autocannon.Request,
): Promise<LoadFigures> {
  const result = await autocannon({
    url,
    connections,
    duration: DURATION_S,
    timeout: 10,
    requests: [request],
  })
  return {
    name,
    connections,
    requestsPerSecond: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    total: result.requests.total,
    failures: result.non2xx + result.errors + result.timeouts,
  }
}

async function signIn(base: string, email: string): Promise<string> {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password: BENCH_PASSWORD }),
  })
  if (!response.ok) throw new Error(`sign-in ${email}: ${response.status} ${await response.text()}`)
  return ((await response.json()) as { accessToken: string }).accessToken
}

export interface ApiBenchResult {
  seedMs: number
  counts: Record<string, number>
  submissionEvents: number
  bare: LoadFigures
  gradebook: LoadFigures
  submission: LoadFigures
}

export async function runApiBenchmark(): Promise<ApiBenchResult> {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-bench-api-'))
  const seeded = await bulkSeed(join(dataDir, 'slipway.sqlite'), ISSUE_SHAPE)
  const bareServer = await startBareExpress()
  let server
  try {
    server = await startSlipway(dataDir)
    const instructor = seeded.instructors[0]!
    const apprentice = seeded.apprentices.find((a) => a.cohortId === instructor.cohortId)!
    const instructorToken = await signIn(server.url, instructor.email)
    const apprenticeToken = await signIn(server.url, apprentice.email)

    // Warm-up (JIT, SQLite page cache) so the timed loads measure steady state.
    const gradebookPath = `/api/cohorts/${instructor.cohortId}/gradebook?page=2&pageSize=50&sort=average&order=desc`
    for (let i = 0; i < 20; i++) {
      await fetch(server.url + gradebookPath, { headers: { authorization: `Bearer ${instructorToken}` } })
      await fetch(bareServer.url)
    }

    const bare = await load('bare Express {}', bareServer.url, 50, { method: 'GET', path: '/' })
    await bareServer.stop()

    const gradebook = await load('gradebook page', server.url, 50, {
      method: 'GET',
      path: gradebookPath,
      headers: { authorization: `Bearer ${instructorToken}` },
    })

    const events = paddedLog(fixtureLog('raise-lower-commissioning'), 2000)
    const eventsJson = JSON.stringify(events)
    const assignmentId = seeded.assignments[0]![0]!
    const submission = await load('attempt submission', server.url, 10, {
      method: 'POST',
      path: '/api/attempts',
      headers: { authorization: `Bearer ${apprenticeToken}`, 'content-type': 'application/json' },
      // A fresh client id per request, so every request is a new attempt graded on the server.
      setupRequest: (req) => ({
        ...req,
        body: `{"id":"${randomUUID()}","assignmentId":"${assignmentId}","status":"submitted","events":${eventsJson}}`,
      }),
    })
    return {
      seedMs: seeded.seedMs,
      counts: seeded.counts,
      submissionEvents: events.length,
      bare,
      gradebook,
      submission,
    }
  } finally {
    await bareServer.stop()
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  }
}

export function apiRows(r: ApiBenchResult): BenchRow[] {
  const group = 'api'
  // A figure counts only if every request succeeded and enough completed to give a p99 at all.
  const ok = (f: LoadFigures) => f.failures === 0 && f.total >= 100
  const baseline = { name: 'bare Express {}', value: r.bare.requestsPerSecond }
  return [
    { group, name: 'seed 500 apprentices / 40 assignments / 20k attempts', value: r.seedMs, unit: 'ms' },
    { group, name: 'bare Express {} throughput (50 conn)', value: r.bare.requestsPerSecond, unit: 'req/s' },
    { group, name: 'bare Express {} p99', value: r.bare.p99, unit: 'ms' },
    {
      group,
      name: 'gradebook page throughput (50 rows, 50 conn)',
      value: r.gradebook.requestsPerSecond,
      unit: 'req/s',
      baseline,
      target: '≥ 0.20× bare',
      met: ok(r.gradebook) && r.gradebook.requestsPerSecond >= 0.2 * r.bare.requestsPerSecond,
    },
    { group, name: 'gradebook page p50', value: r.gradebook.p50, unit: 'ms' },
    {
      group,
      name: 'gradebook page p99 (50 conn)',
      value: r.gradebook.p99,
      unit: 'ms',
      target: '< 50 ms',
      met: ok(r.gradebook) && r.gradebook.p99 < 50,
    },
    {
      group,
      name: `submission throughput (${r.submissionEvents} events, 10 conn)`,
      value: r.submission.requestsPerSecond,
      unit: 'req/s',
      baseline,
    },
    { group, name: 'submission p50', value: r.submission.p50, unit: 'ms' },
    {
      group,
      name: 'submission p99 (10 conn)',
      value: r.submission.p99,
      unit: 'ms',
      target: '< 100 ms',
      met: ok(r.submission) && r.submission.p99 < 100,
    },
    {
      group,
      name: 'failed requests (non-2xx, errors, timeouts; p99 needs ≥ 100 done)',
      value: r.bare.failures + r.gradebook.failures + r.submission.failures,
      unit: '',
      target: '0',
      met: r.bare.failures + r.gradebook.failures + r.submission.failures === 0,
    },
  ]
}

/** The runner `npm run bench` calls. */
export async function runApiBench(): Promise<BenchRow[]> {
  return apiRows(await runApiBenchmark())
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const result = await runApiBenchmark()
  console.log(formatTable(apiRows(result)))
  console.log(
    `\nseeded ${JSON.stringify(result.counts)} in ${result.seedMs.toFixed(0)} ms; ${DURATION_S} s per load; ` +
      `load average ${loadavg()
        .map((l) => l.toFixed(2))
        .join(' ')}`,
  )
  console.log(
    JSON.stringify({ bare: result.bare, gradebook: result.gradebook, submission: result.submission }),
  )
}
