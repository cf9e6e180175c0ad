// Due-date reminders survive a crash and are not sent twice. A server scanning for reminders every two
// seconds (REMINDER_SCAN_CRON) finds a cohort's new assignments due in 30 hours and queues a 48-hour reminder
// per member and assignment; it is killed with SIGKILL while those mails go to the embedded relay and is
// restarted on the same data folder, where its scans go on. Each reminder must reach the relay exactly
// once: the restarted scans find every reminder's dedupe key taken, and mail the dead process held is taken
// over when its lease runs out and delivered under the same Message-ID, which the relay keeps once.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import Database from 'better-sqlite3'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { startSlipway, type ServerProcess } from '../support/server-process'

const ASSIGNMENTS = 6
const LEASE_SECONDS = 3
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms))

describe('due-date reminders when the server is killed and restarted', () => {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-reminders-'))
  const env = { JOB_LEASE_SECONDS: String(LEASE_SECONDS), REMINDER_SCAN_CRON: '*/2 * * * * *' }
  let server: ServerProcess | undefined
  let db: Database.Database
  let expected = -1
  let deliveredBeforeKill = -1
  let scansAfterRestart = -1

  const count = (sql: string) => (db.prepare(sql).get() as { n: number }).n
  /** The drill's reminder jobs (the demo centre has work of its own due soon, reminded too). */
  const drillJobs = `SELECT j.* FROM jobs j JOIN assignments a ON j.dedupeKey LIKE 'reminder:' || a.id || ':%'
     WHERE a.title LIKE 'Restart drill %'`
  const reminderJobs = () => count(`SELECT COUNT(*) AS n FROM (${drillJobs})`)
  const remindersDelivered = () =>
    count(`SELECT COUNT(*) AS n FROM mail_messages WHERE subject LIKE 'Due in two days: Restart drill %'`)
  const reminderJobsDone = () => count(`SELECT COUNT(*) AS n FROM (${drillJobs}) WHERE status = 'done'`)
  const scans = () => count(`SELECT COUNT(*) AS n FROM jobs WHERE kind = 'reminders.scan' AND status = 'done'`)

  beforeAll(async () => {
    server = await startSlipway(dataDir, { env, timeoutMs: 110_000 })
    db = new Database(join(dataDir, 'slipway.sqlite'), { readonly: true, fileMustExist: true })
    const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor')!
    const signIn = await fetch(`${server.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: instructor.email, password: instructor.password }),
    })
    const { accessToken } = (await signIn.json()) as { accessToken: string }
    const headers = { authorization: `Bearer ${accessToken}`, 'content-type': 'application/json' }
    const cohort = (
      (await (await fetch(`${server.url}/api/cohorts`, { headers })).json()) as { items: { id: string }[] }
    ).items[0]!
    const scenario = (
      (await (await fetch(`${server.url}/api/scenarios`, { headers })).json()) as { items: { id: string }[] }
    ).items[0]!
    const members = count(
      `SELECT COUNT(*) AS n FROM enrollments e JOIN users u ON u.id = e.userId
       WHERE e.cohortId = '${cohort.id}' AND u.role = 'apprentice' AND u.active = 1`,
    )
    expected = members * ASSIGNMENTS
    for (let i = 0; i < ASSIGNMENTS; i++) {
      const response = await fetch(`${server.url}/api/cohorts/${cohort.id}/assignments`, {
        method: 'POST',
        headers,
        body: JSON.stringify({
          scenarioId: scenario.id,
          title: `Restart drill ${i + 1}`,
          opensAt: new Date(Date.now() - 3_600_000).toISOString(),
          dueAt: new Date(Date.now() + 30 * 3_600_000).toISOString(),
          attemptLimit: null,
          hintsAllowed: true,
        }),
      })
      expect(response.status).toBe(201)
    }
    // Kill once the relay has some reminders, preferably with others still to send.
    const deadline = Date.now() + 30_000
    while (remindersDelivered() < 1 && Date.now() < deadline) await sleep(2)
    await server.stop('SIGKILL')
    deliveredBeforeKill = remindersDelivered()

    server = await startSlipway(dataDir, { env, timeoutMs: 110_000 })
    const scansAtRestart = scans()
    const done = Date.now() + 60_000
    // Every reminder sent, and at least three scans since the restart that could have queued one again.
    while (Date.now() < done && (reminderJobsDone() < expected || scans() < scansAtRestart + 3)) await sleep(200)
    scansAfterRestart = scans() - scansAtRestart
  })

  afterAll(async () => {
    db?.close()
    await server?.stop()
    rmSync(dataDir, { recursive: true, force: true })
  })

  it('queued a reminder per member and assignment, and was killed with some delivered', () => {
    console.log(
      `reminders-restart: ${deliveredBeforeKill} of ${expected} reminders delivered before SIGKILL; ` +
        `${scansAfterRestart} scans after the restart`,
    )
    expect(expected).toBeGreaterThan(0)
    expect(reminderJobs()).toBe(expected)
    expect(deliveredBeforeKill).toBeGreaterThan(0)
    expect(scansAfterRestart).toBeGreaterThanOrEqual(3)
  })

  it('delivers each reminder exactly once to the relay', () => {
    const perReminder = db
      .prepare(
        `SELECT toAddress || ' / ' || subject AS reminder, COUNT(*) AS n FROM mail_messages
         WHERE subject LIKE 'Due in two days: Restart drill %' GROUP BY 1`,
      )
      .all() as { reminder: string; n: number }[]
    expect(perReminder).toHaveLength(expected)
    expect(perReminder.filter((r) => r.n !== 1)).toEqual([])
    expect(reminderJobsDone()).toBe(expected)
  })

  it('delivers every reminder job, the demo centre’s own included, under its one Message-ID, once', () => {
    const perJob = db
      .prepare(
        `SELECT j.status, (SELECT COUNT(*) FROM mail_messages m WHERE m.messageId LIKE '<' || j.id || '@%') AS n
         FROM jobs j WHERE j.dedupeKey LIKE 'reminder:%'`,
      )
      .all() as { status: string; n: number }[]
    expect(perJob.length).toBeGreaterThanOrEqual(expected)
    expect(perJob.filter((j) => j.status !== 'done' || j.n !== 1)).toEqual([])
  })

  it('leaves an intact database', () => {
    expect(db.pragma('integrity_check')).toEqual([{ integrity_check: 'ok' }])
  })
})
