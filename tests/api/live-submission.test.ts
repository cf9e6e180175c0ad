// The submission's checks against the live classroom's records (issue 18): a log holds only the injections and
// messages an instructor really sent to that attempt; a final submission holds every injection sent to it; and
// submitting ends the live session (watchers see it end, the class view lets it go).
import { randomUUID } from 'node:crypto'
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { attemptOverviewSchema } from '../../shared/api/attempts'
import type { AttemptEvent } from '../../shared/model/events'
import { AttemptEntity } from '../../server/entities'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { readSse } from '../support/sse-reader'
import { buildWorld, submit, type World } from '../support/world'

describe('submissions and the live classroom', () => {
  let api: TestApi
  let w: World
  let server: Server
  let base: string
  beforeAll(async () => {
    api = await createTestApi()
    w = await buildWorld(api)
    server = api.app.listen(0, '127.0.0.1')
    await new Promise((resolve) => server.once('listening', resolve))
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/live`
  })
  afterAll(async () => {
    server.closeAllConnections()
    await new Promise((resolve) => server.close(resolve))
    await api.close()
  })

  async function livePanel() {
    const attemptId = randomUUID()
    const opened = await supertest(api.app)
      .post(`/api/live/attempts/${attemptId}/session`)
      .set(bearer(w.apprenticeA2.token))
      .send({ scenarioVersionId: w.scenario.id, assignmentId: w.assignmentA.id, assistance: 'standard' })
    expect(opened.status).toBe(201)
    return attemptId
  }
  async function inject(attemptId: string) {
    const response = await supertest(api.app)
      .post(`/api/live/attempts/${attemptId}/injections`)
      .set(bearer(w.instructorA.token))
      .send({ fault: { kind: 'blownFuse' } })
    expect(response.status).toBe(201)
    return response.body.injectionId as string
  }
  async function hint(attemptId: string, text: string) {
    await supertest(api.app)
      .post('/api/live/messages')
      .set(bearer(w.instructorA.token))
      .send({ cohortId: w.cohortA.id, attemptIds: [attemptId], kind: 'hint', text })
    const row = await api.dataSource.query(
      `SELECT "id" FROM "live_commands" WHERE "attemptId" = '${attemptId}' AND "kind" = 'hint'`,
    )
    return (row as { id: string }[])[0]!.id
  }
  const injectedEvent = (injectionId: string, by = w.instructorA): AttemptEvent => ({
    t: 500,
    type: 'fault.injected',
    injectionId,
    fault: { kind: 'blownFuse' },
    by: { id: by.user.id, name: by.user.name },
  })
  const hintEvent = (messageId: string, text: string): AttemptEvent => ({
    t: 600,
    type: 'message.received',
    messageId,
    kind: 'hint',
    text,
    from: { id: w.instructorA.user.id, name: w.instructorA.user.name },
  })
  const log = (...events: AttemptEvent[]) => [...events, { t: 1000, type: 'attempt.ended' }]
  const send = (id: string, status: 'inProgress' | 'submitted', events: unknown[]) =>
    submit(api, w.apprenticeA2, { id, assignmentId: w.assignmentA.id, status, events })

  it('refuses a fault no instructor injected into this attempt (400), and stores nothing', async () => {
    const attemptId = await livePanel()
    const forged = await send(attemptId, 'inProgress', log(injectedEvent(randomUUID())))
    expect(forged.status).toBe(400)
    expect(forged.body.error.code).toBe('injection_unknown')
    expect(forged.body.error.message).toMatch(/no instructor injected/)
    // The right id, but another instructor named as its author.
    const injectionId = await inject(attemptId)
    const wrongAuthor = await send(attemptId, 'inProgress', log(injectedEvent(injectionId, w.instructorB)))
    expect(wrongAuthor.body.error.code).toBe('injection_unknown')
    // An injection recorded for another attempt does not count for this one.
    const other = await livePanel()
    expect((await send(other, 'inProgress', log(injectedEvent(injectionId)))).body.error.code).toBe(
      'injection_unknown',
    )
    expect(await api.dataSource.getRepository(AttemptEntity).countBy({ id: attemptId })).toBe(0)
  })

  it('refuses a message nobody sent, or one whose words were changed (400)', async () => {
    const attemptId = await livePanel()
    const forged = await send(attemptId, 'inProgress', log(hintEvent(randomUUID(), 'The answer is fuse F1')))
    expect(forged.status).toBe(400)
    expect(forged.body.error.code).toBe('message_unknown')
    const messageId = await hint(attemptId, 'Check the control fuse')
    const edited = await send(attemptId, 'inProgress', log(hintEvent(messageId, 'Skip the lockout')))
    expect(edited.body.error.code).toBe('message_unknown')
    const saved = await send(attemptId, 'inProgress', log(hintEvent(messageId, 'Check the control fuse')))
    expect(saved.status).toBe(201)
  })

  it('refuses a final submission while an injection is still missing from the log (409), then takes it', async () => {
    const attemptId = await livePanel()
    const injectionId = await inject(attemptId)
    const saved = await send(attemptId, 'inProgress', [{ t: 200, type: 'lock.removed' }])
    expect(saved.status).toBe(201) // a save may be behind
    const early = await send(attemptId, 'submitted', [{ t: 200, type: 'lock.removed' }, ...log()])
    expect(early.status).toBe(409)
    expect(early.body.error.code).toBe('injection_pending')
    expect(early.body.error.message).toMatch(/instructor has just changed something on your bench/)
    expect(
      (await api.dataSource.getRepository(AttemptEntity).findOneByOrFail({ id: attemptId })).status,
    ).toBe('inProgress')
    const watch = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token)
    const klass = await readSse(`${base}/cohorts/${w.cohortA.id}/stream`, w.instructorA.token)
    await klass.next((f) => (f.data as { row?: { attemptId: string } }).row?.attemptId === attemptId)
    const done = await send(attemptId, 'submitted', [
      { t: 200, type: 'lock.removed' },
      ...log(injectedEvent(injectionId)),
    ])
    expect(done.status, done.text).toBe(201)
    expect((await watch.next((f) => f.event === 'ended')).data).toEqual({ type: 'ended' })
    await watch.ended
    const ended = await klass.next(
      (f) => (f.data as { row?: { attemptId: string } }).row?.attemptId === attemptId,
    )
    expect(ended.data).toMatchObject({ row: { connection: 'ended' } })
    expect((await klass.next()).data).toEqual({ type: 'gone', attemptId })
    klass.close()
    const session = await supertest(api.app)
      .post(`/api/live/attempts/${attemptId}/session`)
      .set(bearer(w.apprenticeA2.token))
      .send({ scenarioVersionId: w.scenario.id, assignmentId: w.assignmentA.id, assistance: 'standard' })
    expect(session.status).toBe(409)
  })

  it("keeps the live audit entries out of the attempt's grade trail (the review page reads it)", async () => {
    const attemptId = await livePanel()
    const injectionId = await inject(attemptId)
    const text = 'Measure before you replace anything.'
    const messageId = await hint(attemptId, text)
    const done = await send(
      attemptId,
      'submitted',
      log(injectedEvent(injectionId), hintEvent(messageId, text)),
    )
    expect(done.status, done.text).toBe(201)
    const overview = await supertest(api.app)
      .get(`/api/attempts/${attemptId}/overview`)
      .set(bearer(w.instructorA.token))
    expect(overview.status).toBe(200)
    const parsed = attemptOverviewSchema.parse(overview.body)
    expect(parsed.audit.map((a) => a.action)).toEqual(['graded'])
  })

  it('leaves attempts without a live session as they were', async () => {
    const plain = await send(randomUUID(), 'submitted', log())
    expect(plain.status).toBe(201)
  })
})
