// One apprentice's record for their instructors (every cohort of theirs the caller teaches): assignments
// under their own terms, every attempt including free practice, learning outcomes met, feedback.
import { In, IsNull, type DataSource } from 'typeorm'
import type { ApprenticeRecord } from '@shared/api/apprentices'
import { summarise } from '@shared/progress'
import { apprenticeFor } from '../access/access.service'
import { violationsOf } from '../attempts/evidence'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  FeedbackEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type ScenarioRow,
  type UserRow,
} from '../entities'
import { nowIso } from '../infrastructure/clock'
import { pairKey, standingsFor } from '../gradebook/standings'
import {
  presentApprenticeAssignment,
  presentApprenticeAttempt,
  presentOutcomes,
  type RecordAttemptRow,
} from './apprentice.presenter'

const ATTEMPTS_MAX = 500

/** Their attempts on the given assignments and their free practice, newest first, without event logs. */
async function attemptsOf(
  ds: DataSource,
  userId: string,
  assignmentIds: string[],
): Promise<RecordAttemptRow[]> {
  const select = {
    id: true,
    assignmentId: true,
    scenarioId: true,
    status: true,
    startedAt: true,
    updatedAt: true,
    submittedAt: true,
    score: true,
    passed: true,
    late: true,
    autoScore: true,
    autoPassed: true,
    reviewedAt: true,
    evidence: true,
  } as const
  const where = [
    { userId, assignmentId: IsNull() },
    ...(assignmentIds.length ? [{ userId, assignmentId: In(assignmentIds) }] : []),
  ]
  return ds
    .getRepository(AttemptEntity)
    .find({ where, select, order: { startedAt: 'DESC' }, take: ATTEMPTS_MAX })
}

export async function apprenticeRecord(
  ctx: AppContext,
  viewer: UserRow,
  apprenticeId: string,
): Promise<ApprenticeRecord> {
  const ds = ctx.dataSource
  const { apprentice, cohorts: taught } = await apprenticeFor(ds, viewer, apprenticeId)
  const cohortIds = taught.map((c) => c.cohortId)
  const cohorts = cohortIds.length ? await ds.getRepository(CohortEntity).findBy({ id: In(cohortIds) }) : []
  const assignments: AssignmentRow[] = cohortIds.length
    ? await ds
        .getRepository(AssignmentEntity)
        .find({ where: { cohortId: In(cohortIds) }, order: { dueAt: 'ASC' } })
    : []
  const now = nowIso()
  const standings = await standingsFor(ds, assignments, [apprentice.id], now, apprentice.id)
  const attempts = await attemptsOf(
    ds,
    apprentice.id,
    assignments.map((a) => a.id),
  )
  const scenarioIds = [
    ...new Set([...assignments.map((a) => a.scenarioId), ...attempts.map((a) => a.scenarioId)]),
  ]
  const scenarios: Pick<ScenarioRow, 'id' | 'key' | 'version' | 'title' | 'document'>[] = scenarioIds.length
    ? await ds.getRepository(ScenarioEntity).find({
        where: { id: In(scenarioIds) },
        select: { id: true, key: true, version: true, title: true, document: true },
      })
    : []
  const feedback = attempts.length
    ? await ds
        .getRepository(FeedbackEntity)
        .find({ where: { attemptId: In(attempts.map((a) => a.id)) }, order: { createdAt: 'DESC' } })
    : []
  const authors = feedback.length
    ? await ds.getRepository(UserEntity).find({
        where: { id: In([...new Set(feedback.map((f) => f.authorId))]) },
        select: { id: true, name: true },
      })
    : []

  const cohortName = new Map(cohorts.map((c) => [c.id, c.name]))
  const assignmentById = new Map(assignments.map((a) => [a.id, a]))
  const scenarioById = new Map(scenarios.map((s) => [s.id, s]))
  const exercise = (row: RecordAttemptRow) =>
    (row.assignmentId ? assignmentById.get(row.assignmentId)?.title : null) ??
    scenarioById.get(row.scenarioId)?.title ??
    ''
  const rows = assignments.map((a) =>
    presentApprenticeAssignment(
      a,
      cohortName.get(a.cohortId) ?? '',
      standings.get(pairKey(a.id, apprentice.id))!,
    ),
  )
  const summary = summarise(
    assignments.map((a) => {
      const s = standings.get(pairKey(a.id, apprentice.id))!
      return { status: s.status, score: s.bestScore, counts: s.counts }
    }),
  )
  return {
    apprentice: {
      id: apprentice.id,
      name: apprentice.name,
      email: apprentice.email,
      active: Boolean(apprentice.active),
    },
    cohorts: taught.map((t) => {
      const cohort = cohorts.find((c) => c.id === t.cohortId)!
      return {
        id: cohort.id,
        name: cohort.name,
        enrolledAt: t.enrolledAt,
        archived: Boolean(cohort.archived),
      }
    }),
    summary: { ...summary, practiceAttempts: attempts.filter((a) => !a.assignmentId).length },
    assignments: rows.filter((r) => r.status !== 'notAssigned'),
    attempts: attempts.map((a) =>
      presentApprenticeAttempt(a, {
        assignmentTitle: a.assignmentId ? (assignmentById.get(a.assignmentId)?.title ?? null) : null,
        scenarioTitle: scenarioById.get(a.scenarioId)?.title ?? '',
        violations: violationsOf(a.evidence).map((v) => ({ kind: v.label, text: v.text })),
        now,
      }),
    ),
    outcomes: presentOutcomes(scenarios, attempts),
    feedback: feedback.map((f) => {
      const attempt = attempts.find((a) => a.id === f.attemptId)!
      return {
        attemptId: f.attemptId,
        exercise: exercise(attempt),
        authorName: authors.find((u) => u.id === f.authorId)?.name ?? '',
        body: f.body,
        createdAt: f.createdAt,
      }
    }),
  }
}
