// Mail survives a crash and is not sent twice: 100 invitation mails are queued in one transaction, the server
// is killed with SIGKILL while its worker is handing them to the embedded relay, and restarted on the same data
// folder. Every message must then reach the relay exactly once: jobs the dead process held are taken over when
// their lease runs out, and one it had already handed over (accepted, not yet marked sent) is delivered again
// under the same Message-ID, which the relay keeps once.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { startSlipway, type ServerProcess } from '../support/server-process'

const MAILS = 100
const LEASE_SECONDS = 3
const recipient = (i: number) => `sigkill-${String(i).padStart(3, '0')}@kestrelvale.example`

async function signIn(base: string, email: string, password: string) {
  const response = await fetch(`${base}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email, password }),
  })
  expect(response.status).toBe(200)
  return ((await response.json()) as { accessToken: string }).accessToken
}

describe('mail when the server is killed while sending', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-mail-sigkill-'))
  const env = { JOB_LEASE_SECONDS: String(LEASE_SECONDS) }
  let server: ServerProcess | undefined
  let db: Database.Database
  let deliveredBeforeKill = -1
  let runningAtKill = -1
  let acceptedNotMarked = -1

  const delivered = () =>
    (
      db.prepare(`SELECT COUNT(*) AS n FROM mail_messages WHERE toAddress LIKE 'sigkill-%'`).get() as {
        n: number
      }
    ).n
  const sentJobs = () =>
    (
      db
        .prepare(
          `SELECT COUNT(*) AS n FROM jobs WHERE kind = 'mail' AND label LIKE 'sigkill-%' AND status = 'done'`,
        )
        .get() as { n: number }
    ).n
  const jobsBy = () =>
    db
      .prepare(
        `SELECT status, attempts, COUNT(*) AS n FROM jobs WHERE kind = 'mail' AND label LIKE 'sigkill-%'
         GROUP BY status, attempts ORDER BY status, attempts`,
      )
      .all() as { status: string; attempts: number; n: number }[]

  beforeAll(async () => {
    server = await startSlipway(dataDir, { env, timeoutMs: 110_000 })
    db = new Database(join(dataDir, 'slipway.sqlite'), { readonly: true, fileMustExist: true })
    const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor')!
    const token = await signIn(server.url, instructor.email, instructor.password)
    const cohorts = (await (
      await fetch(`${server.url}/api/cohorts`, { headers: { authorization: `Bearer ${token}` } })
    ).json()) as { items: { id: string }[] }
    const csv = ['email,name', ...Array.from({ length: MAILS }, (_, i) => `${recipient(i)},Crash Test ${i}`)]
    const form = new FormData()
    form.append('roster', new Blob([csv.join('\n') + '\n'], { type: 'text/csv' }), 'roster.csv')
    const response = await fetch(`${server.url}/api/cohorts/${cohorts.items[0]!.id}/invitations/roster`, {
      method: 'POST',
      headers: { authorization: `Bearer ${token}` },
      body: form,
    })
    expect(response.status).toBe(201)
    // Kill once the relay has some of them, preferably at a moment when it holds a message whose job is not yet
    // marked sent (the case the Message-ID is for); by half-way, whatever the moment.
    const deadline = Date.now() + 30_000
    for (;;) {
      const received = delivered()
      if ((received >= 5 && received > sentJobs()) || received >= MAILS / 2 || Date.now() > deadline) break
      await new Promise((r) => setTimeout(r, 1))
    }
    await server.stop('SIGKILL')
    deliveredBeforeKill = delivered()
    acceptedNotMarked = deliveredBeforeKill - sentJobs()
    runningAtKill = jobsBy()
      .filter((j) => j.status === 'running')
      .reduce((sum, j) => sum + j.n, 0)
    server = await startSlipway(dataDir, { env, timeoutMs: 110_000 })
    const done = Date.now() + 60_000
    while (Date.now() < done) {
      const remaining = jobsBy()
        .filter((j) => j.status !== 'done')
        .reduce((sum, j) => sum + j.n, 0)
      if (remaining === 0) break
      await new Promise((r) => setTimeout(r, 200))
    }
  })

  afterAll(async () => {
    db?.close()
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  it('was killed with mail still to send', () => {
    console.log(
      `mail-sigkill: ${deliveredBeforeKill} of ${MAILS} delivered before SIGKILL, ${runningAtKill} held by the ` +
        `killed process (${acceptedNotMarked} of them already accepted by the relay, not yet marked sent); ` +
        `after the restart: ${JSON.stringify(jobsBy())}`,
    )
    expect(deliveredBeforeKill).toBeGreaterThan(0)
    expect(deliveredBeforeKill).toBeLessThan(MAILS)
  })

  it('delivers every message exactly once to the relay after the restart', () => {
    const perRecipient = db
      .prepare(
        `SELECT toAddress AS address, COUNT(*) AS n FROM mail_messages WHERE toAddress LIKE 'sigkill-%'
         GROUP BY toAddress ORDER BY toAddress`,
      )
      .all() as { address: string; n: number }[]
    expect(perRecipient).toEqual(Array.from({ length: MAILS }, (_, i) => ({ address: recipient(i), n: 1 })))
  })

  it('marks every mail job sent, those the killed process held after a second attempt', () => {
    const jobs = jobsBy()
    expect(jobs.every((j) => j.status === 'done')).toBe(true)
    expect(jobs.reduce((sum, j) => sum + j.n, 0)).toBe(MAILS)
    const retried = jobs.filter((j) => j.attempts === 2).reduce((sum, j) => sum + j.n, 0)
    expect(retried).toBe(runningAtKill)
  })

  it('leaves an intact database', () => {
    expect(db.pragma('integrity_check')).toEqual([{ integrity_check: 'ok' }])
  })
})
