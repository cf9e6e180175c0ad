// Durability under a crash: 300 attempts from 20 concurrent clients against the production server in a
// child process, SIGKILL part-way, restart on the same data folder, then check what was acknowledged.
import { randomUUID } from 'node:crypto'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { AttemptEvent } from '../../shared/model/events'
import { createDataSource } from '../../server/infrastructure/database/data-source'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { fixtureLog, paddedLog } from '../bench/bulk-seed'
import { startSlipway, type ServerProcess } from '../support/server-process'

const TOTAL = 300
const CLIENTS = 20
const KILL_AFTER_ACKS = 140

interface Planned {
  id: string
  token: string
  body: string
  events: AttemptEvent[]
}
interface Ack {
  status: number
  score: number
  passed: boolean
}

async function signIn(base: string, email: string, password: string) {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  if (response.status !== 200)
    throw new Error(`sign-in ${email}: ${response.status} ${await response.text()}`)
  return ((await response.json()) as { accessToken: string }).accessToken
}

async function post(base: string, attempt: Planned) {
  return fetch(`${base}/api/attempts`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', authorization: `Bearer ${attempt.token}` },
    body: attempt.body,
    signal: AbortSignal.timeout(20_000),
  })
}

describe('durability when the server is killed mid-way through submissions', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-durability-'))
  let server: ServerProcess | undefined
  const plan: Planned[] = []
  const acked = new Map<string, Ack>()
  let failedInFlight = 0

  beforeAll(async () => {
    // A fresh data folder: the first start migrates and seeds the demo centre (argon2id at full cost).
    server = await startSlipway(dataDir, { timeoutMs: 110_000 })
    const apprentices = DEMO_ACCOUNTS.filter((a) => a.role === 'apprentice').slice(0, 4)
    const tokens = await Promise.all(apprentices.map((a) => signIn(server!.url, a.email, a.password)))
    const scenarios = (await (
      await fetch(`${server.url}/api/scenarios`, { headers: { authorization: `Bearer ${tokens[0]}` } })
    ).json()) as { items: { id: string; key: string }[] }
    const scenarioId = scenarios.items.find((s) => s.key === 'two-wire-run-stop')!.id
    const base = fixtureLog('two-wire-run-stop')
    for (let i = 0; i < TOTAL; i++) {
      // Every attempt has a log of its own length, so a swapped or truncated log is caught.
      const events = paddedLog(base, base.length + 1 + i)
      const id = randomUUID()
      const body = JSON.stringify({ id, scenarioId, status: 'submitted', events })
      plan.push({ id, token: tokens[i % tokens.length]!, body, events })
    }

    let next = 0
    let killed: Promise<void> | undefined
    let refusedBusy = 0
    const client = async () => {
      while (next < plan.length && !killed) {
        const attempt = plan[next++]!
        try {
          let response = await post(server!.url, attempt)
          // A full grading queue answers 503 with Retry-After and stores nothing: send the same attempt again
          // after the wait, as the app's client does (useAttemptSubmission), until the kill.
          while (response.status === 503 && !killed) {
            refusedBusy++
            await response.body?.cancel()
            const seconds = Number(response.headers.get('retry-after') ?? 1)
            await new Promise((resolve) => setTimeout(resolve, Math.min(seconds, 2) * 1000))
            if (killed) break
            response = await post(server!.url, attempt)
          }
          if (response.status === 503) continue
          const json = (await response.json()) as { grade: { score: number; passed: boolean } | null }
          if (response.status === 201 || response.status === 200) {
            acked.set(attempt.id, {
              status: response.status,
              score: json.grade!.score,
              passed: json.grade!.passed,
            })
          }
        } catch {
          failedInFlight++
        }
        if (acked.size >= KILL_AFTER_ACKS && !killed) killed = server!.stop('SIGKILL')
      }
    }
    await Promise.all(Array.from({ length: CLIENTS }, client))
    if (!killed) {
      // Never reached the kill: stop this server rather than leave it running beside the restarted one.
      await server.stop('SIGKILL')
      throw new Error(`only ${acked.size} of ${TOTAL} acknowledged (${refusedBusy} refused busy): no kill`)
    }
    await killed
    console.log(`durability: ${refusedBusy} answers were 503 (grading queue full), each sent again`)
    server = await startSlipway(dataDir, { timeoutMs: 110_000 })
  })

  afterAll(async () => {
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  it('was killed with work still outstanding', () => {
    expect(acked.size).toBeGreaterThanOrEqual(KILL_AFTER_ACKS)
    expect(acked.size).toBeLessThan(TOTAL)
    console.log(
      `durability: ${acked.size} acknowledged before SIGKILL, ${failedInFlight} cut off in flight, ` +
        `${TOTAL - acked.size - failedInFlight} never sent`,
    )
  })

  it('keeps every acknowledged attempt, intact and graded as acknowledged, after the restart', async () => {
    for (const attempt of plan.filter((p) => acked.has(p.id))) {
      const response = await fetch(`${server!.url}/api/attempts/${attempt.id}`, {
        headers: { authorization: `Bearer ${attempt.token}` },
      })
      expect(response.status).toBe(200)
      const detail = (await response.json()) as {
        status: string
        eventCount: number
        events: unknown[]
        grade: { score: number; passed: boolean }
      }
      const ack = acked.get(attempt.id)!
      expect(detail.status).toBe('submitted')
      expect(detail.eventCount).toBe(attempt.events.length)
      expect(detail.events).toEqual(attempt.events)
      expect({ score: detail.grade.score, passed: detail.grade.passed }).toEqual({
        score: ack.score,
        passed: ack.passed,
      })
    }
  })

  it('creates no duplicates when every attempt is sent again with the same id', async () => {
    for (const attempt of plan) {
      const response = await post(server!.url, attempt)
      // Already stored (acknowledged, or committed just before the kill): 200; new: 201.
      expect([200, 201]).toContain(response.status)
      if (acked.has(attempt.id)) expect(response.status).toBe(200)
    }
    await server!.stop()
    const db = new Database(join(dataDir, 'slipway.sqlite'), { readonly: true })
    try {
      const ids = plan.map((p) => p.id)
      const marks = ids.map(() => '?').join(',')
      const stored = db.prepare(`SELECT COUNT(*) AS n FROM attempts WHERE id IN (${marks})`).get(...ids) as {
        n: number
      }
      const gradings = db
        .prepare(
          `SELECT entityId, COUNT(*) AS n FROM audit_entries WHERE action = 'grade.graded' AND entityId IN (${marks}) GROUP BY entityId`,
        )
        .all(...ids) as { entityId: string; n: number }[]
      expect(stored.n).toBe(TOTAL)
      expect(gradings).toHaveLength(TOTAL)
      expect(gradings.every((g) => g.n === 1)).toBe(true)
      expect(db.pragma('integrity_check', { simple: true })).toBe('ok')
    } finally {
      db.close()
    }
  })

  it('runs SQLite in WAL mode with the synchronous level the server opens it with', async () => {
    const ds = createDataSource({ databasePath: join(dataDir, 'slipway.sqlite') })
    await ds.initialize()
    try {
      const [{ journal_mode: journal }] = await ds.query('PRAGMA journal_mode')
      const [{ synchronous }] = await ds.query('PRAGMA synchronous')
      console.log(`durability: journal_mode=${journal}, synchronous=${synchronous} (0 off, 1 normal, 2 full)`)
      expect(journal).toBe('wal')
      // NORMAL (1) or FULL (2): a committed transaction survives a process crash in WAL mode either way.
      expect(Number(synchronous)).toBeGreaterThanOrEqual(1)
    } finally {
      await ds.destroy()
    }
  })
})
