// The live classroom across two API processes sharing one PostgreSQL database (issue 18): a change posted to
// one instance reaches streams held by the other (LISTEN/NOTIFY), in both directions, watchers included.
import { randomUUID } from 'node:crypto'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { jsonCall } from '../support/json-call'
import { STATUS } from '../support/live-status'
import { readSse, type SseFrame } from '../support/sse-reader'
import { createPostgresTestDatabase, onPostgres, type TestDatabase } from '../support/test-database'
import { startServerProcess, type ServerProcess } from '../support/server-process'

const JWT_SECRET = 'live-scale-shared-secret-'.padEnd(48, 'z')
// The demo: Idris teaches the autumn cohort, Ravi is in it.
const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor' && a.cohort === 0)!
const apprentice = DEMO_ACCOUNTS.find((a) => a.role === 'apprentice' && a.cohort === 0)!

const call = jsonCall

async function signIn(server: ServerProcess, who: { email: string; password: string }) {
  const reply = await call(server, 'POST', '/api/auth/sign-in', undefined, {
    email: who.email,
    password: who.password,
  })
  expect(reply.status).toBe(200)
  return reply.body.accessToken as string
}

describe.skipIf(!onPostgres)('the live classroom on two instances sharing PostgreSQL', () => {
  let db: TestDatabase
  let a: ServerProcess
  let b: ServerProcess
  let apprenticeOnA: string
  let instructorOnB: string
  let cohortId: string
  let scenarioVersionId: string

  beforeAll(async () => {
    db = await createPostgresTestDatabase()
    const env = { DATABASE_URL: db.url, JWT_SECRET, PUBLIC_BASE_URL: 'http://slipway.test', DEMO: 'true' }
    ;[a, b] = await Promise.all([startServerProcess(env), startServerProcess(env)])
    apprenticeOnA = await signIn(a, apprentice)
    instructorOnB = await signIn(b, instructor)
    const cohorts = (await call(b, 'GET', '/api/cohorts', instructorOnB)).body as {
      items: { id: string; name: string }[]
    }
    cohortId = cohorts.items.find((c) => c.name.startsWith('Autumn'))!.id
    const scenarios = (await call(a, 'GET', '/api/scenarios', apprenticeOnA)).body as {
      items: { id: string }[]
    }
    scenarioVersionId = scenarios.items[0]!.id
  })

  afterAll(async () => {
    await Promise.all([a?.stop(), b?.stop()])
    await db?.drop()
  })

  it('streams to instance B what the apprentice posts to instance A, and B’s injection reaches A’s inbox', async () => {
    const attemptId = randomUUID()
    const rowOf = (f: SseFrame) => (f.data as { row?: { attemptId: string; eventCount: number } }).row
    const klass = await readSse(`${b.url}/api/live/cohorts/${cohortId}/stream`, instructorOnB)
    expect(klass.status).toBe(200)
    const opened = await call(a, 'POST', `/api/live/attempts/${attemptId}/session`, apprenticeOnA, {
      scenarioVersionId,
      assignmentId: null,
      assistance: 'standard',
    })
    expect(opened.status).toBe(201)
    expect(rowOf(await klass.next((f) => rowOf(f)?.attemptId === attemptId, 10_000))).toMatchObject({
      eventCount: 0,
    })
    const posted = await call(a, 'POST', `/api/live/attempts/${attemptId}/events`, apprenticeOnA, {
      from: 0,
      events: [{ t: 100, type: 'lock.removed' }],
      status: STATUS,
    })
    expect(posted.status).toBe(200)
    const changed = await klass.next(
      (f) => rowOf(f)?.attemptId === attemptId && rowOf(f)?.eventCount === 1,
      10_000,
    )
    expect(changed.data).toMatchObject({ type: 'row', row: { apprentice: { name: apprentice.name } } })

    // Watching on B shows on A's inbox; an injection made on B arrives there too.
    const inbox = await readSse(`${a.url}/api/live/attempts/${attemptId}/inbox`, apprenticeOnA)
    const watch = await readSse(`${b.url}/api/live/attempts/${attemptId}/stream`, instructorOnB)
    expect((await watch.next((f) => f.event === 'events', 10_000)).data).toMatchObject({ from: 0 })
    const watched = await inbox.next(
      (f) => (f.data as { watchers?: unknown[] }).watchers?.length === 1,
      10_000,
    )
    expect(watched.data).toMatchObject({ watchers: [{ name: instructor.name }] })
    const injected = await call(b, 'POST', `/api/live/attempts/${attemptId}/injections`, instructorOnB, {
      fault: { kind: 'blownFuse' },
    })
    expect(injected.status).toBe(201)
    const arrived = await inbox.next((f) => f.event === 'injection', 10_000)
    expect(arrived).toMatchObject({ id: '1', data: { injectionId: injected.body.injectionId } })
    await call(a, 'POST', `/api/live/attempts/${attemptId}/events`, apprenticeOnA, {
      from: 1,
      events: [{ t: 200, type: 'lock.applied' }],
      status: STATUS,
    })
    expect((await watch.next((f) => f.event === 'events', 10_000)).data).toMatchObject({ from: 1 })
    watch.close()
    expect(
      (await inbox.next((f) => (f.data as { watchers?: unknown[] }).watchers?.length === 0, 10_000)).data,
    ).toEqual({ type: 'watchers', watchers: [] })
    inbox.close()
    klass.close()
  })
})
