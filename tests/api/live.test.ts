// Live classroom (issue 18): sessions and events in order, the class view and its stream, watching one panel,
// injections and messages through the inbox, resuming streams with Last-Event-ID, and the connection words.
// Streams are read from a real listening server with fetch, as the client reads them.
import { randomUUID } from 'node:crypto'
import type { Server } from 'node:http'
import type { AddressInfo } from 'node:net'
import supertest from 'supertest'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import {
  liveAttemptSchema,
  liveClassSchema,
  liveClassStreamEventSchema,
  liveInboxEventSchema,
  liveWatchStreamEventSchema,
} from '../../shared/api/live'
import { AuditEntryEntity, LiveCommandEntity } from '../../server/entities'
import { setClock } from '../../server/infrastructure/clock'
import { bearer, createTestApi, type TestApi, type TestUser } from '../support/api-harness'
import { STATUS } from '../support/live-status'
import { readSse, type SseFrame } from '../support/sse-reader'
import { buildWorld, submit, type World } from '../support/world'

const events = (from: number, n: number) =>
  Array.from({ length: n }, (_, i) => ({ t: 1000 + (from + i) * 100, type: 'lock.removed' as const }))

describe('live classroom', () => {
  let api: TestApi
  let w: World
  let server: Server
  let base: string
  beforeAll(async () => {
    api = await createTestApi({ live: { heartbeatMs: 60_000, sweepMs: 60_000 } })
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

  const post = (who: TestUser, path: string, body?: object) =>
    supertest(api.app)
      .post(`/api/live${path}`)
      .set(bearer(who.token))
      .send(body ?? {})
  const get = (who: TestUser, path: string) =>
    supertest(api.app).get(`/api/live${path}`).set(bearer(who.token))

  async function openPanel(who: TestUser = w.apprenticeA1, assignmentId: string | null = w.assignmentA.id) {
    const attemptId = randomUUID()
    const opened = await post(who, `/attempts/${attemptId}/session`, {
      scenarioVersionId: w.scenario.id,
      assignmentId,
      assistance: 'standard',
    })
    expect(opened.status, opened.text).toBe(201)
    return attemptId
  }
  const send = (attemptId: string, from: number, n: number, who: TestUser = w.apprenticeA1) =>
    post(who, `/attempts/${attemptId}/events`, { from, events: events(from, n), status: STATUS })

  describe('sessions and events', () => {
    it('opens a session at 0 events, and a reopened panel goes on from the count held', async () => {
      const attemptId = await openPanel()
      expect((await send(attemptId, 0, 3)).body).toEqual({ attemptId, eventCount: 3 })
      const again = await post(w.apprenticeA1, `/attempts/${attemptId}/session`, {
        scenarioVersionId: w.scenario.id,
        assignmentId: w.assignmentA.id,
        assistance: 'standard',
      })
      expect(again.status).toBe(200)
      expect(again.body).toEqual({ attemptId, eventCount: 3 })
    })

    it('refuses a bad request in words, and an attempt already submitted or someone else’s', async () => {
      const bad = await post(w.apprenticeA1, `/attempts/${randomUUID()}/session`, {
        scenarioVersionId: 'nope',
        assignmentId: null,
        assistance: 'lots',
      })
      expect(bad.status).toBe(400)
      expect(Object.keys(bad.body.error.details.fields).sort()).toEqual(['assistance', 'scenarioVersionId'])
      const submitted = await post(w.apprenticeA1, `/attempts/${w.attemptA1.id}/session`, {
        scenarioVersionId: w.scenario.id,
        assignmentId: w.assignmentA.id,
        assistance: 'standard',
      })
      expect(submitted.status).toBe(409)
      expect(submitted.body.error.message).toMatch(/already submitted/)
      // A practice attempt saved in progress cannot come back as the assignment's.
      const practiceId = randomUUID()
      const saved = await submit(api, w.apprenticeA1, {
        id: practiceId,
        scenarioId: w.scenario.id,
        status: 'inProgress',
        events: [{ t: 100, type: 'lock.removed' }],
      })
      expect(saved.status).toBe(201)
      const moved = await post(w.apprenticeA1, `/attempts/${practiceId}/session`, {
        scenarioVersionId: w.scenario.id,
        assignmentId: w.assignmentA.id,
        assistance: 'standard',
      })
      expect(moved.status).toBe(409)
      expect(moved.body.error.message).toMatch(/different assignment/)
      const theirs = await openPanel(w.apprenticeA1)
      const taken = await post(w.apprenticeA2, `/attempts/${theirs}/session`, {
        scenarioVersionId: w.scenario.id,
        assignmentId: w.assignmentA.id,
        assistance: 'standard',
      })
      expect(taken.status).toBe(409)
      const elsewhere = await post(w.apprenticeB1, `/attempts/${randomUUID()}/session`, {
        scenarioVersionId: w.scenario.id,
        assignmentId: w.assignmentA.id,
        assistance: 'standard',
      })
      expect(elsewhere.status).toBe(403)
    })

    it('appends in order: a post from the wrong place is 409 with the count expected; no events is a heartbeat', async () => {
      const attemptId = await openPanel()
      expect((await send(attemptId, 0, 2)).status).toBe(200)
      const repeated = await send(attemptId, 0, 2)
      expect(repeated.status).toBe(409)
      expect(repeated.body.error).toMatchObject({ code: 'live_out_of_step', details: { expected: 2 } })
      expect(repeated.body.error.message).toContain('2 actions')
      const ahead = await send(attemptId, 5, 1)
      expect(ahead.body.error.details.expected).toBe(2)
      const heartbeat = await send(attemptId, 2, 0)
      expect(heartbeat.body).toEqual({ attemptId, eventCount: 2 })
      const live = liveAttemptSchema.parse((await get(w.instructorA, `/attempts/${attemptId}`)).body)
      expect(live.events).toEqual(events(0, 2))
      expect(live.row.eventCount).toBe(2)
    })

    it('refuses a bad post in words and changes nothing', async () => {
      const attemptId = await openPanel()
      const bad = await post(w.apprenticeA1, `/attempts/${attemptId}/events`, {
        from: 0,
        events: [{ t: 1, type: 'no.such.event' }],
        status: { ...STATUS, outputHz: 'fast' },
      })
      expect(bad.status).toBe(400)
      expect(bad.body.error.details.fields).toHaveProperty(['status.outputHz'])
      expect((await send(attemptId, 0, 1)).status).toBe(200)
      expect((await send(attemptId, 0, 1, w.apprenticeA2)).status).toBe(403)
      expect((await send(randomUUID(), 0, 1)).status).toBe(404)
    })
  })

  describe('class view', () => {
    it('lists the cohort’s open panels with names, status and connection; practice shows in the apprentice’s cohorts', async () => {
      const assigned = await openPanel(w.apprenticeA2)
      await send(assigned, 0, 1, w.apprenticeA2)
      const practice = await openPanel(w.apprenticeA2, null)
      const view = liveClassSchema.parse((await get(w.instructorA, `/cohorts/${w.cohortA.id}/class`)).body)
      expect(view.cohort.name).toBe('Cohort A')
      const row = view.rows.find((r) => r.attemptId === assigned)!
      expect(row).toMatchObject({
        apprentice: { name: 'Abel Apprentice' },
        assignmentTitle: w.assignmentA.title,
        connection: 'active',
        eventCount: 1,
        status: STATUS,
        watchers: [],
      })
      expect(view.rows.find((r) => r.attemptId === practice)?.assignmentTitle).toBeNull()
      const other = liveClassSchema.parse((await get(w.admin, `/cohorts/${w.cohortB.id}/class`)).body)
      expect(other.rows.map((r) => r.attemptId)).not.toContain(assigned)
    })

    it('turns a row idle after no action and disconnected after no post, on the sweep', async () => {
      const attemptId = await openPanel()
      await send(attemptId, 0, 1)
      const stream = await readSse(`${base}/cohorts/${w.cohortA.id}/stream`, w.instructorA.token)
      const mine = (f: SseFrame) =>
        f.event === 'row' && (f.data as { row: { attemptId: string } }).row.attemptId === attemptId
      await stream.next(mine)
      await api.live.sweep()
      const start = Date.now()
      try {
        setClock(() => start + api.live.limits.idleAfterMs + 1000)
        await send(attemptId, 1, 0) // a heartbeat: seen, but no action
        await api.live.sweep()
        const idle = await stream.next(
          (f) => mine(f) && (f.data as { row: { connection: string } }).row.connection === 'idle',
        )
        expect(idle).toBeDefined()
        setClock(() => start + api.live.limits.idleAfterMs + api.live.limits.disconnectedAfterMs + 2000)
        await api.live.sweep()
        // Nobody posted: only the sweep can have sent this.
        const gone = await stream.next(
          (f) => mine(f) && (f.data as { row: { connection: string } }).row.connection !== 'idle',
        )
        expect((gone.data as { row: { connection: string } }).row.connection).toBe('disconnected')
      } finally {
        setClock(null)
        stream.close()
      }
    })

    it('streams every row first, then each change; a closed panel shows ended, then gone', async () => {
      const attemptId = await openPanel()
      const stream = await readSse(`${base}/cohorts/${w.cohortA.id}/stream`, w.instructorA.token)
      expect(stream.status).toBe(200)
      const first = liveClassStreamEventSchema.parse(
        (await stream.next((f) => (f.data as { row?: { attemptId: string } }).row?.attemptId === attemptId))
          .data,
      )
      expect(first).toMatchObject({ type: 'row', row: { eventCount: 0 } })
      await send(attemptId, 0, 4)
      const changed = await stream.next(
        (f) => f.event === 'row' && (f.data as { row: { attemptId: string } }).row.attemptId === attemptId,
      )
      expect(changed.data).toMatchObject({ row: { eventCount: 4, lastActionAt: expect.any(String) } })
      expect(Number(changed.id)).toBeGreaterThan(Number(stream.frames[0]!.id))
      expect((await post(w.apprenticeA1, `/attempts/${attemptId}/close`)).status).toBe(204)
      const ended = await stream.next(
        (f) => (f.data as { row?: { attemptId: string } }).row?.attemptId === attemptId,
      )
      expect(ended.data).toMatchObject({ row: { connection: 'ended' } })
      expect((await stream.next()).data).toEqual({ type: 'gone', attemptId })
      stream.close()
    })

    it('refuses another cohort’s instructor and apprentices (403), and a missing cohort (404)', async () => {
      expect((await get(w.instructorB, `/cohorts/${w.cohortA.id}/class`)).status).toBe(403)
      expect((await get(w.apprenticeA1, `/cohorts/${w.cohortA.id}/class`)).status).toBe(403)
      expect((await get(w.instructorA, `/cohorts/${randomUUID()}/class`)).status).toBe(404)
      const refused = await readSse(`${base}/cohorts/${w.cohortA.id}/stream`, w.instructorB.token)
      expect(refused.status).toBe(403)
      expect(refused.error).toMatchObject({ error: { code: 'forbidden' } })
    })
  })

  describe('watching one panel', () => {
    it('sends every event, then each new one; the apprentice’s inbox shows who is watching, until they leave', async () => {
      const attemptId = await openPanel()
      await send(attemptId, 0, 3)
      const inbox = await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA1.token)
      expect((await inbox.next()).data).toEqual({ type: 'watchers', watchers: [] })
      const watch = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token)
      const firstEvents = liveWatchStreamEventSchema.parse(
        (await watch.next((f) => f.event === 'events')).data,
      )
      expect(firstEvents).toEqual({ type: 'events', from: 0, events: events(0, 3) })
      expect(watch.frames.find((f) => f.event === 'events')?.id).toBe('2')
      const watching = await inbox.next((f) => (f.data as { watchers: unknown[] }).watchers?.length === 1)
      expect(liveInboxEventSchema.parse(watching.data)).toEqual({
        type: 'watchers',
        watchers: [{ id: w.instructorA.user.id, name: 'Ines Instructor-A' }],
      })
      await send(attemptId, 3, 2)
      const more = await watch.next((f) => f.event === 'events')
      expect(more).toMatchObject({ id: '4', data: { from: 3, events: events(3, 2) } })
      watch.close()
      const left = await inbox.next((f) => f.event === 'watchers')
      expect(left.data).toEqual({ type: 'watchers', watchers: [] })
      inbox.close()
    })

    it('drops a watcher whose stream stopped refreshing it (its instance went away), on the sweep', async () => {
      const attemptId = await openPanel()
      const inbox = await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA1.token)
      const watch = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token)
      await inbox.next((f) => (f.data as { watchers?: unknown[] }).watchers?.length === 1)
      const start = Date.now()
      try {
        // The heartbeat (a minute in these tests) has not refreshed the row for longer than a watcher lasts.
        setClock(() => start + 50_000)
        await api.live.sweep()
        const dropped = await inbox.next((f) => f.event === 'watchers')
        expect(dropped.data).toEqual({ type: 'watchers', watchers: [] })
      } finally {
        setClock(null)
        watch.close()
        inbox.close()
      }
    })

    it('resumes after a reconnect with Last-Event-ID (or ?after=): nothing missed, nothing doubled', async () => {
      const attemptId = await openPanel()
      await send(attemptId, 0, 3)
      const first = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token)
      const seen = (await first.next((f) => f.event === 'events')).data as { events: unknown[] }
      const lastId = first.frames.filter((f) => f.id !== undefined).at(-1)!.id!
      first.close()
      await send(attemptId, 3, 2) // while disconnected
      const again = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token, {
        'Last-Event-ID': lastId,
      })
      const resumed = (await again.next((f) => f.event === 'events')).data as {
        from: number
        events: unknown[]
      }
      expect(resumed.from).toBe(3)
      await send(attemptId, 5, 1)
      const live = (await again.next((f) => f.event === 'events')).data as { from: number; events: unknown[] }
      expect([...seen.events, ...resumed.events, ...live.events]).toEqual(events(0, 6))
      again.close()
      const byQuery = await readSse(`${base}/attempts/${attemptId}/stream?after=4`, w.instructorA.token)
      expect((await byQuery.next((f) => f.event === 'events')).data).toEqual({
        type: 'events',
        from: 5,
        events: events(5, 1),
      })
      byQuery.close()
      expect((await get(w.instructorA, `/attempts/${attemptId}/stream?after=soon`)).status).toBe(400)
    })

    it('refuses another cohort’s instructor and apprentices; a missing session is 404', async () => {
      const attemptId = await openPanel()
      expect((await get(w.instructorB, `/attempts/${attemptId}`)).status).toBe(403)
      expect((await get(w.apprenticeA2, `/attempts/${attemptId}`)).status).toBe(403)
      expect((await get(w.instructorA, `/attempts/${randomUUID()}`)).status).toBe(404)
      expect((await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorB.token)).status).toBe(403)
      expect((await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA2.token)).status).toBe(403)
      expect((await readSse(`${base}/attempts/${attemptId}/inbox`, w.instructorA.token)).status).toBe(403)
    })
  })

  describe('injections and messages', () => {
    it('injects a fault into the inbox, in order, with an audit entry; a reconnect resumes after the sequence', async () => {
      const attemptId = await openPanel()
      const inbox = await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA1.token)
      const injected = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'blownFuse' },
      })
      expect(injected.status).toBe(201)
      const frame = await inbox.next((f) => f.event === 'injection')
      expect(frame.id).toBe('1')
      expect(liveInboxEventSchema.parse(frame.data)).toEqual({
        type: 'injection',
        injectionId: injected.body.injectionId,
        fault: { kind: 'blownFuse' },
        by: { id: w.instructorA.user.id, name: 'Ines Instructor-A' },
        at: injected.body.at,
      })
      const audit = await api.dataSource
        .getRepository(AuditEntryEntity)
        .findOneByOrFail({ entityId: attemptId, action: 'live.fault_injected' })
      expect(audit.actorId).toBe(w.instructorA.user.id)
      inbox.close()
      const sent = await post(w.instructorA, '/messages', {
        cohortId: w.cohortA.id,
        attemptIds: [attemptId],
        kind: 'hint',
        text: '  Measure across the fuse  ',
      })
      expect(sent.body).toEqual({ sent: 1 })
      const resumed = await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA1.token, {
        'Last-Event-ID': '1',
      })
      const next = await resumed.next((f) => f.event !== 'watchers')
      expect(next).toMatchObject({
        id: '2',
        event: 'message',
        data: { kind: 'hint', text: 'Measure across the fuse' },
      })
      expect(resumed.frames.filter((f) => f.event === 'injection')).toEqual([])
      resumed.close()
    })

    it('sends a message to every open panel of the cohort when no attempt is named', async () => {
      const one = await openPanel(w.apprenticeA1)
      const two = await openPanel(w.apprenticeA2)
      const sent = await post(w.instructorA, '/messages', {
        cohortId: w.cohortA.id,
        kind: 'message',
        text: 'Tools down in five minutes',
      })
      expect(sent.status).toBe(200)
      expect(sent.body.sent).toBeGreaterThanOrEqual(2)
      const rows = await api.dataSource.getRepository(LiveCommandEntity).findBy({ kind: 'message' })
      expect(rows.map((r) => r.attemptId)).toEqual(expect.arrayContaining([one, two]))
      const audits = await api.dataSource
        .getRepository(AuditEntryEntity)
        .countBy({ action: 'live.message_sent' })
      expect(audits).toBe(rows.length)
    })

    it('refuses bad input in words, panels of other cohorts, and other instructors', async () => {
      const attemptId = await openPanel()
      const badFault = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'gremlins' },
      })
      expect(badFault.status).toBe(400)
      // Well formed, but not on this bench: a wire it does not have; a fault it already has.
      const noSuchWire = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'brokenWire', wireId: randomUUID() },
      })
      expect(noSuchWire.status).toBe(400)
      expect(noSuchWire.body.error.details.fields.fault).toEqual(['Not on this bench, or already faulted'])
      const first = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'blownFuse' },
      })
      expect(first.status).toBe(201)
      const again = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'blownFuse' },
      })
      expect(again.status).toBe(409)
      expect(again.body.error.message).toMatch(/already on its way/)
      const applied = await post(w.apprenticeA1, `/attempts/${attemptId}/events`, {
        from: 0,
        events: [
          {
            t: 100,
            type: 'fault.injected',
            injectionId: first.body.injectionId,
            fault: { kind: 'blownFuse' },
            by: { id: w.instructorA.user.id, name: w.instructorA.user.name },
          },
        ],
        status: STATUS,
      })
      expect(applied.status).toBe(200)
      const twice = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'blownFuse' },
      })
      expect(twice.status).toBe(400)
      expect(twice.body.error.message).toMatch(/does not offer that fault now/)
      const empty = await post(w.instructorA, '/messages', {
        cohortId: w.cohortA.id,
        kind: 'hint',
        text: '   ',
      })
      expect(empty.body.error.details.fields.text).toEqual(['Write the message'])
      const notHere = await post(w.instructorA, '/messages', {
        cohortId: w.cohortA.id,
        attemptIds: [randomUUID()],
        kind: 'hint',
        text: 'Hello',
      })
      expect(notHere.status).toBe(400)
      expect(notHere.body.error.message).toMatch(/not open in this cohort/)
      expect(
        (await post(w.instructorB, `/attempts/${attemptId}/injections`, { fault: { kind: 'blownFuse' } }))
          .status,
      ).toBe(403)
      expect(
        (await post(w.apprenticeA1, `/attempts/${attemptId}/injections`, { fault: { kind: 'blownFuse' } }))
          .status,
      ).toBe(403)
      expect(
        (await post(w.instructorB, '/messages', { cohortId: w.cohortA.id, kind: 'hint', text: 'Hi' })).status,
      ).toBe(403)
      await post(w.apprenticeA1, `/attempts/${attemptId}/close`)
      const late = await post(w.instructorA, `/attempts/${attemptId}/injections`, {
        fault: { kind: 'blownFuse' },
      })
      expect(late.status).toBe(409)
      expect(late.body.error.message).toMatch(/no longer open/)
    })
  })

  // Last: a drain refuses every later request.
  it('ends its streams when the server drains for a shutdown, so they do not hold it', async () => {
    const attemptId = await openPanel()
    const klass = await readSse(`${base}/cohorts/${w.cohortA.id}/stream`, w.instructorA.token)
    const watch = await readSse(`${base}/attempts/${attemptId}/stream`, w.instructorA.token)
    const inbox = await readSse(`${base}/attempts/${attemptId}/inbox`, w.apprenticeA1.token)
    await Promise.all([klass.next(), watch.next(), inbox.next()])
    expect(api.lifecycle.inFlight).toBeGreaterThanOrEqual(3)
    expect(await api.lifecycle.drain(5000)).toBe(true)
    await Promise.all([klass.ended, watch.ended, inbox.ended])
    expect(api.lifecycle.inFlight).toBe(0)
  })
})
