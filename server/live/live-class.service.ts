// The instructor's side: a cohort's class view, one attempt watched live, and the access rule they share —
// only the instructors of a session's cohort (owner and co-instructors) and admins.
import type { LiveAttempt, LiveClass, LiveRow } from '@shared/api/live'
import type { AttemptEvent } from '@shared/model/events'
import { MoreThanOrEqual } from 'typeorm'
import { cohortFor, teaches } from '../access/access.service'
import type { AppContext } from '../context'
import { CohortEntity, LiveEventEntity, type UserRow } from '../entities'
import { forbidden, notFound } from '../http-error'
import { nowMs } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import type { LoadedSession } from './live-rows'
import { openSessionsOfCohort } from './live-rows'
import { presentLiveRow } from './live.presenter'

/** The cohort, if the user may see its class view (404 missing, 403 not theirs). */
export async function classCohort(ctx: AppContext, user: UserRow, cohortId: string) {
  if (user.role === 'apprentice') {
    if (!(await findById(ctx.dataSource, CohortEntity, cohortId))) throw notFound('Cohort')
    throw forbidden('Only the cohort’s instructors can see its class')
  }
  return cohortFor(ctx.dataSource, user, cohortId, 'manage')
}

export async function classView(ctx: AppContext, user: UserRow, cohortId: string): Promise<LiveClass> {
  const cohort = await classCohort(ctx, user, cohortId)
  return { cohort: { id: cohort.id, name: cohort.name }, rows: await classRows(ctx, cohort.id) }
}

export async function classRows(ctx: AppContext, cohortId: string): Promise<LiveRow[]> {
  const now = nowMs()
  return (await openSessionsOfCohort(ctx.dataSource, cohortId, now)).map(({ session, facts }) =>
    presentLiveRow(session, facts, now, ctx.live.limits),
  )
}

/** A session the user may watch or command: 404 missing, 403 unless they teach one of its cohorts (or admin). */
export async function watchableSession(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<LoadedSession> {
  const loaded = await ctx.live.loaded(attemptId)
  if (!loaded) throw notFound('Live session')
  if (user.role === 'admin') return loaded
  if (user.role === 'instructor') {
    for (const cohortId of loaded.cohortIds) {
      const cohort = await findById(ctx.dataSource, CohortEntity, cohortId)
      if (cohort && (await teaches(ctx.dataSource, cohort, user.id))) return loaded
    }
  }
  throw forbidden('Only the instructors of this apprentice’s cohort can watch this panel')
}

export function rowOf(ctx: AppContext, loaded: LoadedSession): LiveRow {
  return presentLiveRow(loaded.session, loaded.facts, nowMs(), ctx.live.limits)
}

export async function liveAttempt(ctx: AppContext, user: UserRow, attemptId: string): Promise<LiveAttempt> {
  const loaded = await watchableSession(ctx, user, attemptId)
  return { row: rowOf(ctx, loaded), cohortIds: loaded.cohortIds, events: await eventsFrom(ctx, attemptId, 0) }
}

/** The live copy of the log from index `from` on. */
export async function eventsFrom(ctx: AppContext, attemptId: string, from: number): Promise<AttemptEvent[]> {
  const rows = await ctx.dataSource.getRepository(LiveEventEntity).find({
    where: { attemptId, eventIndex: MoreThanOrEqual(from) },
    order: { eventIndex: 'ASC' },
  })
  // Only an unbroken run from `from`: a gap (a post still committing) waits for the next change.
  const events: AttemptEvent[] = []
  for (const row of rows) {
    if (row.eventIndex !== from + events.length) break
    events.push(JSON.parse(row.event) as AttemptEvent)
  }
  return events
}
