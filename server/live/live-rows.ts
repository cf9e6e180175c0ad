// Reading live sessions as the class view shows them: one session with what its row needs, or every open
// session of a cohort with one query per kind of fact (never one per row).
import { In, IsNull, MoreThan, type DataSource } from 'typeorm'
import {
  AssignmentEntity,
  CohortEntity,
  EnrollmentEntity,
  LiveSessionEntity,
  LiveWatcherEntity,
  ScenarioEntity,
  UserEntity,
  type LiveSessionRow,
} from '../entities'
import { findById } from '../infrastructure/database/lookups'
import type { Person, RowFacts } from './live.presenter'

/** A session silent for this long leaves the class view (a panel closed without saying so, days ago). */
export const LIVE_FORGOTTEN_AFTER_MS = 12 * 3_600_000
/** A watcher whose stream has not refreshed its row for this long is gone (its instance stopped). */
export const WATCHER_STALE_MS = 45_000

export interface LoadedSession {
  session: LiveSessionRow
  facts: RowFacts
  /** The cohorts whose class view shows it: the assignment's, or for practice every active cohort of the apprentice. */
  cohortIds: string[]
}

const freshSince = (nowMs: number) => new Date(nowMs - WATCHER_STALE_MS).toISOString()

async function watchersByAttempt(ds: DataSource, attemptIds: string[], nowMs: number) {
  const byAttempt = new Map<string, Person[]>()
  if (!attemptIds.length) return byAttempt
  const rows = await ds
    .getRepository(LiveWatcherEntity)
    .findBy({ attemptId: In(attemptIds), seenAt: MoreThan(freshSince(nowMs)) })
  const names = await namesOf(
    ds,
    rows.map((r) => r.userId),
  )
  for (const row of rows) {
    const list = byAttempt.get(row.attemptId) ?? []
    // One person with two tabs open is one watcher.
    if (!list.some((p) => p.id === row.userId))
      list.push({ id: row.userId, name: names.get(row.userId) ?? '' })
    byAttempt.set(row.attemptId, list)
  }
  for (const list of byAttempt.values()) list.sort((a, b) => a.name.localeCompare(b.name))
  return byAttempt
}

async function namesOf(ds: DataSource, ids: string[]) {
  const unique = [...new Set(ids)]
  if (!unique.length) return new Map<string, string>()
  const users = await ds
    .getRepository(UserEntity)
    .find({ where: { id: In(unique) }, select: { id: true, name: true } })
  return new Map(users.map((u) => [u.id, u.name]))
}

/** Every active cohort the apprentice is in (practice sessions show in each). */
async function activeCohortsOf(ds: DataSource, apprenticeId: string): Promise<string[]> {
  const enrolments = await ds.getRepository(EnrollmentEntity).findBy({ userId: apprenticeId })
  if (!enrolments.length) return []
  const cohorts = await ds
    .getRepository(CohortEntity)
    .findBy({ id: In(enrolments.map((e) => e.cohortId)), archived: false })
  return cohorts.map((c) => c.id)
}

/** Facts of several sessions at once. */
async function factsOf(
  ds: DataSource,
  sessions: LiveSessionRow[],
  nowMs: number,
): Promise<Map<string, RowFacts>> {
  const names = await namesOf(
    ds,
    sessions.map((s) => s.apprenticeId),
  )
  const scenarioIds = [...new Set(sessions.map((s) => s.scenarioId))]
  const scenarios = scenarioIds.length
    ? await ds.getRepository(ScenarioEntity).find({
        where: { id: In(scenarioIds) },
        select: { id: true, key: true, title: true },
      })
    : []
  const scenarioById = new Map(scenarios.map((s) => [s.id, s]))
  const assignmentIds = [...new Set(sessions.flatMap((s) => (s.assignmentId ? [s.assignmentId] : [])))]
  const assignments = assignmentIds.length
    ? await ds.getRepository(AssignmentEntity).find({
        where: { id: In(assignmentIds) },
        select: { id: true, title: true },
      })
    : []
  const titleOf = new Map(assignments.map((a) => [a.id, a.title]))
  const watchers = await watchersByAttempt(
    ds,
    sessions.map((s) => s.attemptId),
    nowMs,
  )
  const facts = new Map<string, RowFacts>()
  for (const s of sessions) {
    const scenario = scenarioById.get(s.scenarioId)
    facts.set(s.attemptId, {
      apprentice: { id: s.apprenticeId, name: names.get(s.apprenticeId) ?? '' },
      scenario: { key: scenario?.key ?? '', title: scenario?.title ?? '', versionId: s.scenarioId },
      assignmentTitle: s.assignmentId ? (titleOf.get(s.assignmentId) ?? null) : null,
      watchers: watchers.get(s.attemptId) ?? [],
    })
  }
  return facts
}

/** What a session's row shows that hardly ever changes while it is open: names, titles, its cohorts. */
export interface SteadyFacts {
  apprentice: Person
  scenario: RowFacts['scenario']
  assignmentTitle: string | null
  cohortIds: string[]
}

export async function steadyFactsOf(ds: DataSource, session: LiveSessionRow): Promise<SteadyFacts> {
  const [apprentice, scenario, assignment] = await Promise.all([
    findById(ds, UserEntity, session.apprenticeId),
    findById(ds, ScenarioEntity, session.scenarioId),
    session.assignmentId ? findById(ds, AssignmentEntity, session.assignmentId) : null,
  ])
  return {
    apprentice: { id: session.apprenticeId, name: apprentice?.name ?? '' },
    scenario: { key: scenario?.key ?? '', title: scenario?.title ?? '', versionId: session.scenarioId },
    assignmentTitle: assignment?.title ?? null,
    cohortIds: session.assignmentId
      ? assignment
        ? [assignment.cohortId]
        : []
      : await activeCohortsOf(ds, session.apprenticeId),
  }
}

/** Who is watching one session now. */
export async function watchersOf(ds: DataSource, attemptId: string, nowMs: number): Promise<Person[]> {
  return (await watchersByAttempt(ds, [attemptId], nowMs)).get(attemptId) ?? []
}

/** The sessions a cohort's class view shows: open, not forgotten, of its assignments or its members' practice. */
export async function openSessionsOfCohort(
  ds: DataSource,
  cohortId: string,
  nowMs: number,
): Promise<{ session: LiveSessionRow; facts: RowFacts }[]> {
  const assignments = await ds
    .getRepository(AssignmentEntity)
    .find({ where: { cohortId }, select: { id: true } })
  const members = await ds.getRepository(EnrollmentEntity).findBy({ cohortId })
  const recent = MoreThan(new Date(nowMs - LIVE_FORGOTTEN_AFTER_MS).toISOString())
  const where = [
    ...(assignments.length
      ? [{ endedAt: IsNull(), lastSeenAt: recent, assignmentId: In(assignments.map((a) => a.id)) }]
      : []),
    ...(members.length
      ? [
          {
            endedAt: IsNull(),
            lastSeenAt: recent,
            assignmentId: IsNull(),
            apprenticeId: In(members.map((m) => m.userId)),
          },
        ]
      : []),
  ]
  if (!where.length) return []
  const sessions = await ds.getRepository(LiveSessionEntity).find({ where, order: { openedAt: 'ASC' } })
  const facts = await factsOf(ds, sessions, nowMs)
  return sessions.map((session) => ({ session, facts: facts.get(session.attemptId)! }))
}

/** Open sessions any class view may show (the sweep's list). */
export function openSessions(ds: DataSource, nowMs: number) {
  return ds.getRepository(LiveSessionEntity).findBy({
    endedAt: IsNull(),
    lastSeenAt: MoreThan(new Date(nowMs - LIVE_FORGOTTEN_AFTER_MS).toISOString()),
  })
}
