// The apprentice's side of a live session: open it for an attempt, post events in order (or a heartbeat),
// close it, and read the inbox (injections and messages to append to the log, who is watching).
import type {
  LiveInboxEvent,
  LiveSession,
  OpenLiveSessionRequest,
  PostLiveEventsRequest,
} from '@shared/api/live'
import type { InjectedFault } from '@shared/model/setup'
import { In, IsNull, MoreThan, type EntityManager } from 'typeorm'
import { isEnrolled } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  LiveCommandEntity,
  LiveEventEntity,
  LiveSessionEntity,
  ScenarioEntity,
  UserEntity,
  type LiveCommandRow,
  type LiveSessionRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict, forbidden, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'

/** The session of an attempt of the user's own: 404 missing, 403 someone else's. */
export async function ownSession(ctx: AppContext, user: UserRow, attemptId: string): Promise<LiveSessionRow> {
  const session = await findById(ctx.dataSource, LiveSessionEntity, attemptId)
  if (!session) throw notFound('Live session')
  if (session.apprenticeId !== user.id) throw forbidden('This attempt is not yours')
  return session
}

export async function openSession(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  body: OpenLiveSessionRequest,
): Promise<{ created: boolean; session: LiveSession }> {
  const ds = ctx.dataSource
  const attempt = await findById(ds, AttemptEntity, attemptId)
  if (attempt && attempt.userId !== user.id)
    throw conflict('attempt_conflict', 'This attempt id is already in use')
  if (attempt?.status === 'submitted')
    throw conflict('attempt_conflict', 'This attempt is already submitted; start a new one to work live')
  if (attempt && attempt.assignmentId !== body.assignmentId)
    throw conflict('attempt_conflict', 'This attempt belongs to a different assignment')
  const scenario = await findById(ds, ScenarioEntity, body.scenarioVersionId)
  if (!scenario) {
    throw new HttpError(400, 'validation_failed', 'No such scenario version', {
      fields: { scenarioVersionId: ['No such scenario version'] },
    })
  }
  let assistance = attempt?.assistanceLevel ?? body.assistance
  if (body.assignmentId) {
    const assignment = await findById(ds, AssignmentEntity, body.assignmentId)
    if (!assignment) throw notFound('Assignment')
    if (!(await isEnrolled(ds, assignment.cohortId, user.id)))
      throw forbidden('This assignment is not set for you')
    if (assignment.scenarioId !== scenario.id) {
      throw new HttpError(400, 'validation_failed', 'This assignment is set on another scenario version', {
        fields: { scenarioVersionId: ['Not the assignment’s scenario version'] },
      })
    }
    assistance = attempt?.assistanceLevel ?? assignment.assistanceLevel
  }
  const existing = await findById(ds, LiveSessionEntity, attemptId)
  if (existing && existing.apprenticeId !== user.id)
    throw conflict('attempt_conflict', 'This attempt id is already in use')
  const now = nowIso()
  const sessions = ds.getRepository(LiveSessionEntity)
  if (existing) {
    // A reopened panel (reload, another tab): the session goes on from the events already held.
    await sessions.update({ attemptId }, { endedAt: null, lastSeenAt: now })
    ctx.live.bus.publish({ attemptId, what: 'row' })
    return { created: false, session: { attemptId, eventCount: existing.eventCount } }
  }
  try {
    await sessions.insert({
      attemptId,
      apprenticeId: user.id,
      scenarioId: scenario.id,
      assignmentId: body.assignmentId,
      assistance,
      openedAt: now,
      lastSeenAt: now,
      lastActionAt: null,
      endedAt: null,
      eventCount: 0,
      status: null,
    })
  } catch (error) {
    // The same panel opening twice at once: the other request created it.
    const winner = await findById(ds, LiveSessionEntity, attemptId)
    if (winner?.apprenticeId !== user.id) throw error
    return { created: false, session: { attemptId, eventCount: winner.eventCount } }
  }
  ctx.live.bus.publish({ attemptId, what: 'row' })
  return { created: true, session: { attemptId, eventCount: 0 } }
}

class OutOfStep extends Error {
  constructor(readonly expected: number) {
    super('out of step')
  }
}

/** Appends the events at `from` (which must be the count held) and the status; no events is a heartbeat. */
export async function postEvents(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  body: PostLiveEventsRequest,
): Promise<LiveSession> {
  const session = await ownSession(ctx, user, attemptId)
  if (session.endedAt) throw conflict('conflict', 'This live session has ended; open it again to go on')
  const now = nowIso()
  const count = body.from + body.events.length
  try {
    await ctx.dataSource.transaction(async (manager: EntityManager) => {
      // Conditional on the count: of two posts from the same place, one wins and the other learns where to go on.
      const changed = await manager.getRepository(LiveSessionEntity).update(
        { attemptId, eventCount: body.from, endedAt: IsNull() },
        {
          eventCount: count,
          status: JSON.stringify(body.status),
          lastSeenAt: now,
          ...(body.events.length ? { lastActionAt: now } : {}),
        },
      )
      if (!changed.affected) {
        const held = await manager.getRepository(LiveSessionEntity).findOneBy({ attemptId })
        throw new OutOfStep(held?.eventCount ?? 0)
      }
      if (body.events.length) {
        await manager.getRepository(LiveEventEntity).insert(
          body.events.map((event, i) => ({
            attemptId,
            eventIndex: body.from + i,
            event: JSON.stringify(event),
          })),
        )
      }
    })
  } catch (error) {
    if (error instanceof OutOfStep) {
      throw conflict(
        'live_out_of_step',
        `The server holds ${error.expected} actions of this attempt; send from there`,
        { expected: error.expected },
      )
    }
    throw error
  }
  ctx.live.bus.publish({ attemptId, what: body.events.length ? 'events' : 'row' })
  return { attemptId, eventCount: count }
}

export async function closeSession(ctx: AppContext, user: UserRow, attemptId: string): Promise<void> {
  const session = await ownSession(ctx, user, attemptId)
  if (session.endedAt) return
  await endSession(ctx, attemptId)
}

/** Ends a session (closed for good, or its attempt submitted): watch streams get `ended`, class views `gone`. */
export async function endSession(ctx: AppContext, attemptId: string): Promise<void> {
  const changed = await ctx.dataSource
    .getRepository(LiveSessionEntity)
    .update({ attemptId, endedAt: IsNull() }, { endedAt: nowIso() })
  if (changed.affected) ctx.live.bus.publish({ attemptId, what: 'ended' })
}

/** Inbox entries after `after` (the inbox sequence), oldest first, each as the stream sends it. */
export async function inboxSince(
  ctx: AppContext,
  attemptId: string,
  after: number,
): Promise<{ sequence: number; event: LiveInboxEvent }[]> {
  const ds = ctx.dataSource
  const rows = await ds
    .getRepository(LiveCommandEntity)
    .find({ where: { attemptId, sequence: MoreThan(after) }, order: { sequence: 'ASC' } })
  const senders = rows.length
    ? await ds.getRepository(UserEntity).find({
        where: { id: In([...new Set(rows.map((r) => r.byId))]) },
        select: { id: true, name: true },
      })
    : []
  const nameOf = new Map(senders.map((u) => [u.id, u.name]))
  return rows.map((row) => ({ sequence: row.sequence, event: inboxEvent(row, nameOf.get(row.byId) ?? '') }))
}

export function inboxEvent(row: LiveCommandRow, byName: string): LiveInboxEvent {
  const person = { id: row.byId, name: byName }
  if (row.kind === 'injection')
    return {
      type: 'injection',
      injectionId: row.id,
      fault: JSON.parse(row.payload) as InjectedFault,
      by: person,
      at: row.at,
    }
  return {
    type: 'message',
    messageId: row.id,
    kind: row.kind,
    text: JSON.parse(row.payload) as string,
    from: person,
    at: row.at,
  }
}
