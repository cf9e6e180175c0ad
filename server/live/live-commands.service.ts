// What instructors send into a running attempt: a fault injected on the bench, a hint or a message. Each is a
// row in the apprentice's inbox (in order) and an audit entry, in one transaction; the panel appends it to its
// log, and the submission checks it against these rows (live-checks.ts).
import { randomUUID } from 'node:crypto'
import { isDeepStrictEqual } from 'node:util'
import type { InjectFaultRequest, SendLiveMessageRequest } from '@shared/api/live'
import type { InjectedFault } from '@shared/model/setup'
import type { EntityManager } from 'typeorm'
import type { AppContext } from '../context'
import {
  AuditEntryEntity,
  LiveCommandEntity,
  ScenarioEntity,
  type LiveCommandKind,
  type LiveSessionRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import { classCohort, classRows, eventsFrom, watchableSession } from './live-class.service'

async function record(
  manager: EntityManager,
  command: { attemptId: string; kind: LiveCommandKind; payload: unknown; byId: string; at: string },
) {
  const repo = manager.getRepository(LiveCommandEntity)
  const last = await repo.findOne({ where: { attemptId: command.attemptId }, order: { sequence: 'DESC' } })
  const id = randomUUID()
  await repo.insert({
    id,
    ...command,
    payload: JSON.stringify(command.payload),
    sequence: (last?.sequence ?? 0) + 1,
  })
  await manager.getRepository(AuditEntryEntity).insert({
    id: randomUUID(),
    actorId: command.byId,
    action: command.kind === 'injection' ? 'live.fault_injected' : `live.${command.kind}_sent`,
    entityType: 'attempt',
    entityId: command.attemptId,
    fromValue: null,
    toValue: JSON.stringify({
      id,
      ...(command.kind === 'injection' ? { fault: command.payload } : { text: command.payload }),
    }),
    reason:
      command.kind === 'injection' ? 'Fault injected in the live classroom' : 'Sent in the live classroom',
    createdAt: command.at,
  })
  return id
}

/** Two commands to one attempt at once may pick the same sequence: the loser tries again. */
async function withRetry<T>(work: () => Promise<T>): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await work()
    } catch (error) {
      if (attempt >= 3 || !/unique|duplicate/i.test(String((error as Error).message))) throw error
    }
  }
}

/**
 * Only a fault this bench offers now (what is on it, not already faulted — the instructor's catalogue): a fault
 * naming a wire that is not there would add an objective nobody could meet. The live log is replayed in a
 * grading thread, as a submission is.
 */
async function assertInjectable(ctx: AppContext, session: LiveSessionRow, fault: InjectedFault) {
  const scenario = await findById(ctx.dataSource, ScenarioEntity, session.scenarioId)
  if (!scenario) throw new Error(`live session ${session.attemptId} names a missing scenario version`)
  const events = await eventsFrom(ctx, session.attemptId, 0)
  // One already sent that the panel has not brought in yet counts as there (two instructors, one fuse).
  const applied = new Set(events.flatMap((e) => (e.type === 'fault.injected' ? [e.injectionId] : [])))
  const sent = await ctx.dataSource
    .getRepository(LiveCommandEntity)
    .findBy({ attemptId: session.attemptId, kind: 'injection' })
  if (sent.some((row) => !applied.has(row.id) && isDeepStrictEqual(JSON.parse(row.payload), fault))) {
    throw conflict(
      'injection_pending',
      'That fault is already on its way to this bench; nothing more was injected',
    )
  }
  const offered = await ctx.grading.injectable(scenario, JSON.stringify(events))
  if (!offered.some((candidate) => isDeepStrictEqual(candidate, fault))) {
    throw new HttpError(
      400,
      'validation_failed',
      'This bench does not offer that fault now; nothing was injected',
      {
        fields: { fault: ['Not on this bench, or already faulted'] },
      },
    )
  }
}

export async function injectFault(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
  body: InjectFaultRequest,
): Promise<{ injectionId: string; at: string }> {
  const { session } = await watchableSession(ctx, user, attemptId)
  if (session.endedAt) throw conflict('conflict', 'This panel is no longer open; nothing was injected')
  await assertInjectable(ctx, session, body.fault)
  const at = nowIso()
  const injectionId = await withRetry(() =>
    ctx.dataSource.transaction((manager) =>
      record(manager, { attemptId, kind: 'injection', payload: body.fault, byId: user.id, at }),
    ),
  )
  ctx.live.bus.publish({ attemptId, what: 'inbox' })
  return { injectionId, at }
}

export async function sendMessage(
  ctx: AppContext,
  user: UserRow,
  body: SendLiveMessageRequest,
): Promise<{ sent: number }> {
  const cohort = await classCohort(ctx, user, body.cohortId)
  const open = (await classRows(ctx, cohort.id)).map((row) => row.attemptId)
  let targets = open
  if (body.attemptIds) {
    const unknown = body.attemptIds.filter((id) => !open.includes(id))
    if (unknown.length) {
      throw new HttpError(400, 'validation_failed', 'Some of these panels are not open in this cohort', {
        fields: { attemptIds: ['Not an open panel in this cohort'] },
      })
    }
    targets = [...new Set(body.attemptIds)]
  }
  const at = nowIso()
  for (const attemptId of targets) {
    await withRetry(() =>
      ctx.dataSource.transaction((manager) =>
        record(manager, { attemptId, kind: body.kind, payload: body.text, byId: user.id, at }),
      ),
    )
  }
  for (const attemptId of targets) ctx.live.bus.publish({ attemptId, what: 'inbox' })
  return { sent: targets.length }
}
