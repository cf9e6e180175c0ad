// The three event streams. Each checks access before it opens (so a refusal is the usual JSON error), then
// subscribes to the hub before reading what it sends first, handles changes one at a time in order, and
// unsubscribes when it ends. Ids: the class stream counts from 1 on every connection and always starts with
// the full set of rows; the watch stream's id is the log index of the last event sent; the inbox's is the
// inbox sequence — so a reconnect with Last-Event-ID gets exactly what it has not seen.
import { randomUUID } from 'node:crypto'
import type { LiveClassStreamEvent, LiveInboxEvent, LiveWatchStreamEvent } from '@shared/api/live'
import type { Response } from 'express'
import type { AppContext } from '../context'
import { LiveWatcherEntity, type UserRow } from '../entities'
import { nowIso } from '../infrastructure/clock'
import type { LiveChange } from './live-bus'
import { classCohort, classRows, eventsFrom, rowOf, watchableSession } from './live-class.service'
import { inboxSince, ownSession } from './live-sessions.service'
import { openSse, resumeAfter, type SseStream, type StreamRequest } from './sse'

/** Most events in one `events` frame of the watch stream. */
const EVENTS_PER_FRAME = 500

/** Runs async handlers one after another, so a stream's frames keep the order of its changes. */
function inOrder(stream: SseStream, log: AppContext['log']) {
  let chain = Promise.resolve()
  return (work: () => Promise<void>) => {
    chain = chain
      .then(() => (stream.closed ? undefined : work()))
      .catch((error: unknown) => {
        log.warn({ err: error }, 'live stream: a change could not be sent; closing the stream')
        stream.end()
      })
  }
}

function subscribe(ctx: AppContext, stream: SseStream, onChange: (change: LiveChange) => void) {
  const off = ctx.live.subscribe(onChange)
  stream.onClose(off)
}

export async function streamClass(
  ctx: AppContext,
  req: StreamRequest,
  res: Response,
  user: UserRow,
  cohortId: string,
) {
  const cohort = await classCohort(ctx, user, cohortId)
  const stream = openSse(req, res, ctx.lifecycle, ctx.live.heartbeatMs)
  const run = inOrder(stream, ctx.log)
  let id = 0
  const send = (event: LiveClassStreamEvent) => stream.send(event.type, event, ++id)
  const shown = new Set<string>()

  const sendAll = async () => {
    const rows = await classRows(ctx, cohort.id)
    const now = new Set(rows.map((r) => r.attemptId))
    for (const gone of [...shown].filter((attemptId) => !now.has(attemptId))) {
      shown.delete(gone)
      send({ type: 'gone', attemptId: gone })
    }
    for (const row of rows) {
      shown.add(row.attemptId)
      send({ type: 'row', row })
    }
  }

  subscribe(ctx, stream, (change) => {
    if (change.what === 'inbox') return
    if (change.what === 'resync') return run(sendAll)
    run(async () => {
      const loaded = await ctx.live.loaded(change.attemptId)
      const inClass = loaded?.cohortIds.includes(cohort.id) ?? false
      if (!loaded || !inClass) {
        if (shown.delete(change.attemptId)) send({ type: 'gone', attemptId: change.attemptId })
        return
      }
      const row = rowOf(ctx, loaded)
      if (row.connection === 'ended') {
        // Shown once as ended, then gone from the view.
        if (shown.delete(change.attemptId)) {
          send({ type: 'row', row })
          send({ type: 'gone', attemptId: change.attemptId })
        }
        return
      }
      shown.add(change.attemptId)
      send({ type: 'row', row })
    })
  })
  run(sendAll)
}

export async function streamWatch(
  ctx: AppContext,
  req: StreamRequest,
  res: Response,
  user: UserRow,
  attemptId: string,
  afterQuery?: number,
) {
  await watchableSession(ctx, user, attemptId)
  const after = resumeAfter(req, afterQuery)
  const stream = openSse(req, res, ctx.lifecycle, ctx.live.heartbeatMs)
  const run = inOrder(stream, ctx.log)
  /** Index of the next event to send. */
  let next = after === undefined ? 0 : after + 1
  const lastId = () => (next > 0 ? next - 1 : undefined)
  const send = (event: LiveWatchStreamEvent) => stream.send(event.type, event, lastId())

  const sendEvents = async () => {
    for (;;) {
      const events = await eventsFrom(ctx, attemptId, next)
      if (!events.length) return
      for (let i = 0; i < events.length; i += EVENTS_PER_FRAME) {
        const chunk = events.slice(i, i + EVENTS_PER_FRAME)
        const from = next
        next += chunk.length
        send({ type: 'events', from, events: chunk })
      }
    }
  }
  const sendRow = async () => {
    const loaded = await ctx.live.loaded(attemptId)
    if (loaded) send({ type: 'row', row: rowOf(ctx, loaded) })
    return loaded
  }
  const sendEndIfEnded = async () => {
    const loaded = await sendRow()
    if (loaded?.session.endedAt) {
      send({ type: 'ended' })
      stream.end()
    }
  }

  // Connecting makes the user a watcher; the stream's heartbeat keeps the row fresh for other instances.
  const watchers = ctx.dataSource.getRepository(LiveWatcherEntity)
  const watcherId = randomUUID()
  await watchers.insert({ id: watcherId, attemptId, userId: user.id, seenAt: nowIso() })
  stream.onHeartbeat(
    () => void watchers.update({ id: watcherId }, { seenAt: nowIso() }).catch(() => undefined),
  )
  stream.onClose(() => {
    void watchers
      .delete({ id: watcherId })
      .then(() => ctx.live.bus.publish({ attemptId, what: 'watchers' }))
      .catch(() => undefined)
  })

  subscribe(ctx, stream, (change) => {
    if (change.attemptId !== attemptId && change.what !== 'resync') return
    if (change.what === 'inbox') return
    run(async () => {
      if (change.what === 'events' || change.what === 'ended' || change.what === 'resync') await sendEvents()
      await sendEndIfEnded()
    })
  })
  ctx.live.bus.publish({ attemptId, what: 'watchers' })
  run(async () => {
    await sendEvents()
    await sendEndIfEnded()
  })
}

export async function streamInbox(
  ctx: AppContext,
  req: StreamRequest,
  res: Response,
  user: UserRow,
  attemptId: string,
  afterQuery?: number,
) {
  await ownSession(ctx, user, attemptId)
  let last = resumeAfter(req, afterQuery) ?? 0
  const stream = openSse(req, res, ctx.lifecycle, ctx.live.heartbeatMs)
  const run = inOrder(stream, ctx.log)
  const send = (event: LiveInboxEvent) => stream.send(event.type, event, last > 0 ? last : undefined)

  const sendNew = async () => {
    for (const entry of await inboxSince(ctx, attemptId, last)) {
      last = entry.sequence
      send(entry.event)
    }
  }
  const sendWatchers = async () => {
    const loaded = await ctx.live.loaded(attemptId)
    send({ type: 'watchers', watchers: loaded?.facts.watchers ?? [] })
  }

  subscribe(ctx, stream, (change) => {
    if (change.what === 'resync') return run(async () => (await sendNew(), await sendWatchers()))
    if (change.attemptId !== attemptId) return
    if (change.what === 'inbox') run(sendNew)
    else if (change.what === 'watchers') run(sendWatchers)
  })
  run(async () => {
    await sendNew()
    await sendWatchers()
  })
}
