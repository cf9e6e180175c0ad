// API benchmark: load on loopback against the built production server (child process, plain node), each
// figure beside a baseline measured in the same run:
// - gradebook page (50 connections) against a bare Express route;
// - attempt submission (2,000-event log, 10 connections) against a store-only route that parses the same
//   body and commits it to the same database with the same durability (store-only-server.ts);
// - /api/health latency while 2 MB valid logs are being graded, against its latency when idle;
// - gradebook and submission at 200,000 stored attempts against the same at 20,000.
// Run alone: npx tsx --tsconfig tsconfig.node.json tests/bench/api.bench.ts
// BENCH_API_SCALE=off skips the 200,000-attempt database; BENCH_API_SECONDS sets each load's length.
import { randomUUID } from 'node:crypto'
import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { loadavg, tmpdir } from 'node:os'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import autocannon from 'autocannon'
import type { AttemptEvent } from '../../shared/model/events'
import { bundleFromSource } from '../../scripts/build'
import {
  BENCH_PASSWORD,
  bulkSeed,
  fixtureLog,
  ISSUE_SHAPE,
  paddedLog,
  type BulkSeedResult,
} from './bulk-seed'
import {
  freePort,
  launch,
  startBareExpress,
  startSlipway,
  type ServerProcess,
} from '../support/server-process'
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
  /**
   * CPU time the server process used per completed request (every thread: event loop, grading threads,
   * SQLite's helpers), from /proc; NaN where /proc is missing. It says what a route costs on a machine whose
   * cores are shared, where throughput depends on it.
   */
  cpuMsPerRequest: number
}

/** CPU time (user + system, all threads) a process has used so far, in ms; NaN without /proc. */
export function processCpuMs(pid: number | undefined): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]!.split(' ')
    // utime and stime are fields 14 and 15 of stat (11 and 12 after the command name), in clock ticks.
    return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLOCK_TICKS_PER_SECOND
  } catch {
    return Number.NaN
  }
}
/** USER_HZ: 100 on Linux for every architecture this runs on (sysconf(_SC_CLK_TCK); common practice). */
const CLOCK_TICKS_PER_SECOND = 100

const DURATION_S = Number(process.env.BENCH_API_SECONDS ?? 8)
const SCALE = process.env.BENCH_API_SCALE !== 'off'
const LARGE_ATTEMPTS = 200_000
const BODY_LIMIT = 2 * 1024 * 1024

async function load(
  name: string,
  server: { url: string; child?: { pid?: number } },
  connections: number,
  request: autocannon.Request,
): Promise<LoadFigures> {
  const { url } = server
  const cpuBefore = processCpuMs(server.child?.pid)
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
    cpuMsPerRequest: (processCpuMs(server.child?.pid) - cpuBefore) / Math.max(1, result.requests.total),
  }
}

/** Latency of a cheap GET measured with sub-millisecond resolution (autocannon rounds to whole ms). */
async function sampleLatency(url: string, clients: number, seconds: number) {
  const times: number[] = []
  let failures = 0
  const until = performance.now() + seconds * 1000
  await Promise.all(
    Array.from({ length: clients }, async () => {
      while (performance.now() < until) {
        const started = performance.now()
        try {
          const response = await fetch(url)
          await response.arrayBuffer()
          if (!response.ok) failures++
        } catch {
          failures++
        }
        times.push(performance.now() - started)
      }
    }),
  )
  times.sort((a, b) => a - b)
  const at = (q: number) => times[Math.min(times.length - 1, Math.floor(times.length * q))] ?? NaN
  return { p50: at(0.5), p99: at(0.99), count: times.length, failures }
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

/** A submission body with a fresh attempt id (the log text is serialised once). */
const submissionBody = (assignmentId: string, eventsJson: string) =>
  `{"id":"${randomUUID()}","assignmentId":"${assignmentId}","status":"submitted","events":${eventsJson}}`

/** The longest padded log whose submission body still fits the 2 MB limit. */
function largestValidLog(base: AttemptEvent[]): { events: AttemptEvent[]; json: string } {
  let low = base.length
  let high = 60_000
  while (low < high) {
    const mid = Math.ceil((low + high) / 2)
    if (submissionBody(randomUUID(), JSON.stringify(paddedLog(base, mid))).length < BODY_LIMIT - 4096)
      low = mid
    else high = mid - 1
  }
  const events = paddedLog(base, low)
  return { events, json: JSON.stringify(events) }
}

interface Workload {
  seeded: BulkSeedResult
  instructorToken: string
  apprenticeToken: string
  gradebookPath: string
  assignmentId: string
}

async function prepare(server: ServerProcess, seeded: BulkSeedResult): Promise<Workload> {
  const instructor = seeded.instructors[0]!
  const apprentice = seeded.apprentices.find((a) => a.cohortId === instructor.cohortId)!
  const workload = {
    seeded,
    instructorToken: await signIn(server.url, instructor.email),
    apprenticeToken: await signIn(server.url, apprentice.email),
    gradebookPath: `/api/cohorts/${instructor.cohortId}/gradebook?page=2&pageSize=50&sort=average&order=desc`,
    assignmentId: seeded.assignments[0]![0]!,
  }
  // Warm-up (JIT, SQLite page cache) so the timed loads measure steady state.
  for (let i = 0; i < 20; i++) {
    const response = await fetch(server.url + workload.gradebookPath, {
      headers: { authorization: `Bearer ${workload.instructorToken}` },
    })
    await response.arrayBuffer()
  }
  return workload
}

const gradebookLoad = (server: ServerProcess, w: Workload) =>
  load('gradebook page', server, 50, {
    method: 'GET',
    path: w.gradebookPath,
    headers: { authorization: `Bearer ${w.instructorToken}` },
  })

const submissionLoad = (server: ServerProcess, w: Workload, eventsJson: string) =>
  load('attempt submission', server, 10, {
    method: 'POST',
    path: '/api/attempts',
    headers: { authorization: `Bearer ${w.apprenticeToken}`, 'content-type': 'application/json' },
    // A fresh client id per request, so every request is a new attempt graded on the server.
    setupRequest: (req) => ({ ...req, body: submissionBody(w.assignmentId, eventsJson) }),
  })

/** The store-only baseline on a copy of the same seeded database file. */
async function storeOnlyLoad(databasePath: string, w: Workload, eventsJson: string): Promise<LoadFigures> {
  const port = await freePort()
  const apprentice = w.seeded.apprentices.find((a) => a.cohortId === w.seeded.instructors[0]!.cohortId)!
  const server = await launch({
    script: await bundleFromSource('tests/bench/store-only-server.ts'),
    env: {
      ...process.env,
      PORT: String(port),
      STORE_DATABASE_PATH: databasePath,
      STORE_USER_ID: apprentice.id,
      STORE_SCENARIO_ID: w.seeded.assignmentScenarios[w.assignmentId]!,
    },
    port,
    healthPath: '/',
    timeoutMs: 30_000,
  })
  try {
    return await load('store-only baseline', server, 10, {
      method: 'POST',
      path: '/attempts',
      headers: { 'content-type': 'application/json' },
      setupRequest: (req) => ({ ...req, body: submissionBody(w.assignmentId, eventsJson) }),
    })
  } finally {
    await server.stop()
  }
}

/** /api/health sampled while `submitters` clients keep submitting 2 MB valid logs. */
async function healthWhileGrading(server: ServerProcess, w: Workload, submitters: number) {
  const big = largestValidLog(fixtureLog('raise-lower-commissioning'))
  let graded = 0
  let failed = 0
  let running = true
  const submitting = Array.from({ length: submitters }, async () => {
    while (running) {
      const response = await fetch(`${server.url}/api/attempts`, {
        method: 'POST',
        headers: { authorization: `Bearer ${w.apprenticeToken}`, 'content-type': 'application/json' },
        body: submissionBody(w.assignmentId, big.json),
      })
      await response.arrayBuffer()
      if (response.status === 201) graded++
      else failed++
    }
  })
  // Let the grading threads fill up before sampling.
  await new Promise((r) => setTimeout(r, 500))
  const health = await sampleLatency(`${server.url}/api/health`, 4, DURATION_S)
  running = false
  await Promise.all(submitting)
  return { health, graded, failed, events: big.events.length, bytes: big.json.length }
}

export interface ApiBenchResult {
  seedMs: number
  counts: Record<string, number>
  submissionEvents: number
  bare: LoadFigures
  storeOnly: LoadFigures
  gradebook: LoadFigures
  submission: LoadFigures
  healthIdle: { p50: number; p99: number; count: number; failures: number }
  healthGrading: Awaited<ReturnType<typeof healthWhileGrading>>
  large?: { seedMs: number; attempts: number; gradebook: LoadFigures; submission: LoadFigures }
}

export async function runApiBenchmark(): Promise<ApiBenchResult> {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-bench-api-'))
  const databasePath = join(dataDir, 'slipway.sqlite')
  const events = paddedLog(fixtureLog('raise-lower-commissioning'), 2000)
  const eventsJson = JSON.stringify(events)
  let server: ServerProcess | undefined
  try {
    const seeded = await bulkSeed(databasePath, ISSUE_SHAPE)
    const baselineDir = join(dataDir, 'store-only')
    mkdirSync(baselineDir)
    const baselineDatabase = join(baselineDir, 'slipway.sqlite')
    copyFileSync(databasePath, baselineDatabase)

    const bareServer = await startBareExpress()
    const bare = await load('bare Express {}', bareServer, 50, { method: 'GET', path: '/' })
    await bareServer.stop()

    server = await startSlipway(dataDir)
    const w = await prepare(server, seeded)
    const storeOnly = await storeOnlyLoad(baselineDatabase, w, eventsJson)
    const healthIdle = await sampleLatency(`${server.url}/api/health`, 4, DURATION_S)
    const gradebook = await gradebookLoad(server, w)
    const submission = await submissionLoad(server, w, eventsJson)
    const healthGrading = await healthWhileGrading(server, w, 2)
    await server.stop()
    server = undefined

    let large: ApiBenchResult['large']
    if (SCALE) {
      const largeDir = join(dataDir, 'large')
      mkdirSync(largeDir)
      const largeSeeded = await bulkSeed(join(largeDir, 'slipway.sqlite'), {
        ...ISSUE_SHAPE,
        attempts: LARGE_ATTEMPTS,
      })
      server = await startSlipway(largeDir)
      const lw = await prepare(server, largeSeeded)
      large = {
        seedMs: largeSeeded.seedMs,
        attempts: largeSeeded.counts.attempts,
        gradebook: await gradebookLoad(server, lw),
        submission: await submissionLoad(server, lw, eventsJson),
      }
    }
    return {
      seedMs: seeded.seedMs,
      counts: seeded.counts,
      submissionEvents: events.length,
      bare,
      storeOnly,
      gradebook,
      submission,
      healthIdle,
      healthGrading,
      large,
    }
  } finally {
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  }
}

export function apiRows(r: ApiBenchResult): BenchRow[] {
  const group = 'api'
  // A figure counts only if every request succeeded and enough completed to give a p99 at all.
  const ok = (f: LoadFigures) => f.failures === 0 && f.total >= 100
  const bare = { name: 'bare Express {}', value: r.bare.requestsPerSecond }
  const storeOnly = { name: 'store-only route', value: r.storeOnly.requestsPerSecond }
  const rows: BenchRow[] = [
    { group, name: 'seed 500 apprentices / 40 assignments / 20k attempts', value: r.seedMs, unit: 'ms' },
    { group, name: 'bare Express {} throughput (50 conn)', value: r.bare.requestsPerSecond, unit: 'req/s' },
    { group, name: 'bare Express {} p99', value: r.bare.p99, unit: 'ms' },
    {
      group,
      name: 'gradebook page throughput (50 rows, 50 conn)',
      value: r.gradebook.requestsPerSecond,
      unit: 'req/s',
      baseline: bare,
      target: '≥ 0.5× bare',
      met: ok(r.gradebook) && r.gradebook.requestsPerSecond >= 0.5 * r.bare.requestsPerSecond,
    },
    { group, name: 'gradebook page p50', value: r.gradebook.p50, unit: 'ms' },
    {
      group,
      name: 'gradebook page: server CPU per request (all threads)',
      value: r.gradebook.cpuMsPerRequest,
      unit: 'ms',
      baseline: { name: 'bare Express {}', value: r.bare.cpuMsPerRequest },
    },
    { group, name: 'gradebook page p99 (50 conn, 20k attempts)', value: r.gradebook.p99, unit: 'ms' },
    {
      group,
      name: 'store-only route throughput (same body and database, 10 conn)',
      value: r.storeOnly.requestsPerSecond,
      unit: 'req/s',
    },
    { group, name: 'store-only route p99', value: r.storeOnly.p99, unit: 'ms' },
    {
      group,
      name: 'store-only route: server CPU per request (all threads)',
      value: r.storeOnly.cpuMsPerRequest,
      unit: 'ms',
    },
    {
      group,
      name: `submission throughput (${r.submissionEvents} events, 10 conn)`,
      value: r.submission.requestsPerSecond,
      unit: 'req/s',
      baseline: storeOnly,
      target: '≥ 0.5× store-only',
      met: ok(r.submission) && r.submission.requestsPerSecond >= 0.5 * r.storeOnly.requestsPerSecond,
    },
    { group, name: 'submission p50', value: r.submission.p50, unit: 'ms' },
    {
      group,
      name: 'submission: server CPU per request (all threads)',
      value: r.submission.cpuMsPerRequest,
      unit: 'ms',
      baseline: { name: 'store-only route', value: r.storeOnly.cpuMsPerRequest },
    },
    {
      group,
      name: 'submission p99 (10 conn, 20k attempts)',
      value: r.submission.p99,
      unit: 'ms',
      target: '< 100 ms',
      met: ok(r.submission) && r.submission.p99 < 100,
    },
    { group, name: '/api/health p99 idle (4 clients)', value: r.healthIdle.p99, unit: 'ms' },
    {
      group,
      name: `/api/health p99 while ${(r.healthGrading.bytes / 1e6).toFixed(1)} MB logs grade (${r.healthGrading.graded} graded)`,
      value: r.healthGrading.health.p99,
      unit: 'ms',
      baseline: { name: 'idle p99', value: r.healthIdle.p99 },
      target: '≤ 3× idle',
      met:
        r.healthGrading.failed === 0 &&
        r.healthGrading.graded > 0 &&
        r.healthGrading.health.failures === 0 &&
        r.healthGrading.health.p99 <= 3 * r.healthIdle.p99,
    },
  ]
  const failures =
    r.bare.failures +
    r.storeOnly.failures +
    r.gradebook.failures +
    r.submission.failures +
    r.healthIdle.failures +
    r.healthGrading.health.failures +
    r.healthGrading.failed +
    (r.large ? r.large.gradebook.failures + r.large.submission.failures : 0)
  if (r.large) {
    const l = r.large
    rows.push(
      { group, name: `seed ${l.attempts} attempts`, value: l.seedMs, unit: 'ms' },
      {
        group,
        name: `gradebook page p99 at ${l.attempts / 1000}k attempts`,
        value: l.gradebook.p99,
        unit: 'ms',
        baseline: { name: 'p99 at 20k', value: r.gradebook.p99 },
        target: '≤ 2× at 20k',
        met: ok(l.gradebook) && l.gradebook.p99 <= 2 * r.gradebook.p99,
      },
      {
        group,
        name: `gradebook page throughput at ${l.attempts / 1000}k attempts`,
        value: l.gradebook.requestsPerSecond,
        unit: 'req/s',
        baseline: bare,
      },
      {
        group,
        name: `submission p99 at ${l.attempts / 1000}k attempts`,
        value: l.submission.p99,
        unit: 'ms',
        baseline: { name: 'p99 at 20k', value: r.submission.p99 },
        target: '≤ 1.3× at 20k',
        met: ok(l.submission) && l.submission.p99 <= 1.3 * r.submission.p99,
      },
      {
        group,
        name: `submission throughput at ${l.attempts / 1000}k attempts`,
        value: l.submission.requestsPerSecond,
        unit: 'req/s',
        baseline: { name: 'at 20k', value: r.submission.requestsPerSecond },
      },
    )
  }
  rows.push({
    group,
    name: 'failed requests (non-2xx, errors, timeouts; p99 needs ≥ 100 done)',
    value: failures,
    unit: '',
    target: '0',
    met: failures === 0,
  })
  return rows
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
  const { healthGrading, ...figures } = result
  console.log(JSON.stringify({ ...figures, healthGrading: { ...healthGrading } }))
}
