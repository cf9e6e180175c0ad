// The live copy of a closed panel's log is pruned after a week (housekeeping); open panels, recent ones, the
// session rows and the instructors' injections and messages stay.
import { randomUUID } from 'node:crypto'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { LiveCommandEntity, LiveEventEntity, LiveSessionEntity } from '../../server/entities'
import { LIVE_COPY_RETENTION_DAYS, pruneLiveCopies } from '../../server/live/live-retention'
import { bearer, createTestApi, type TestApi } from '../support/api-harness'
import { STATUS } from '../support/live-status'
import { buildWorld, type World } from '../support/world'

const DAY = 86_400_000

describe('pruning the live copies of closed panels', () => {
  let api: TestApi
  let w: World
  beforeAll(async () => {
    api = await createTestApi({ live: { heartbeatMs: 60_000, sweepMs: 60_000 } })
    w = await buildWorld(api)
  })
  afterAll(() => api.close())

  async function panelWithEvents(n: number): Promise<string> {
    const attemptId = randomUUID()
    const post = (path: string, body: object) =>
      supertest(api.app)
        .post(`/api/live/attempts/${attemptId}${path}`)
        .set(bearer(w.apprenticeA1.token))
        .send(body)
    expect(
      (
        await post('/session', {
          scenarioVersionId: w.scenario.id,
          assignmentId: w.assignmentA.id,
          assistance: 'standard',
        })
      ).status,
    ).toBe(201)
    const events = Array.from({ length: n }, (_, i) => ({ t: 1000 + i * 100, type: 'lock.removed' as const }))
    expect((await post('/events', { from: 0, events, status: STATUS })).status).toBe(200)
    return attemptId
  }
  const sessions = () => api.dataSource.getRepository(LiveSessionEntity)
  const copied = (attemptId: string) => api.dataSource.getRepository(LiveEventEntity).countBy({ attemptId })

  it('deletes the events of sessions ended or silent for longer than the retention, and nothing else', async () => {
    const endedLongAgo = await panelWithEvents(4)
    const silentLongAgo = await panelWithEvents(3)
    const endedRecently = await panelWithEvents(2)
    const open = await panelWithEvents(5)
    // An instructor's message to the panel before it closed: the submission checks and the audit need it kept.
    const sent = await supertest(api.app)
      .post('/api/live/messages')
      .set(bearer(w.instructorA.token))
      .send({ cohortId: w.cohortA.id, attemptIds: [endedLongAgo], kind: 'message', text: 'Well done.' })
    expect(sent.body).toEqual({ sent: 1 })

    const old = new Date(Date.now() - (LIVE_COPY_RETENTION_DAYS + 1) * DAY).toISOString()
    await sessions().update({ attemptId: endedLongAgo }, { endedAt: old, lastSeenAt: old })
    await sessions().update({ attemptId: silentLongAgo }, { lastSeenAt: old })
    await sessions().update({ attemptId: endedRecently }, { endedAt: new Date().toISOString() })

    const pruned = await pruneLiveCopies(
      api.dataSource,
      new Date(Date.now() - LIVE_COPY_RETENTION_DAYS * DAY),
    )

    expect(pruned).toBe(7)
    expect(await copied(endedLongAgo)).toBe(0)
    expect(await copied(silentLongAgo)).toBe(0)
    expect(await copied(endedRecently)).toBe(2)
    expect(await copied(open)).toBe(5)
    // A panel reopened later posts its log from the start; the session row and its messages stay.
    expect((await sessions().findOneByOrFail({ attemptId: endedLongAgo })).eventCount).toBe(0)
    expect((await sessions().findOneByOrFail({ attemptId: open })).eventCount).toBe(5)
    expect(await api.dataSource.getRepository(LiveCommandEntity).countBy({ attemptId: endedLongAgo })).toBe(1)
    // Nothing left to prune: a second run deletes nothing.
    expect(await pruneLiveCopies(api.dataSource, new Date(Date.now() - LIVE_COPY_RETENTION_DAYS * DAY))).toBe(
      0,
    )
  })
})
