// Free practice: what a user may practise, the refusal of practice an instructor has closed, and a cohort's
// practice page (its policy, and how much its apprentices practise).
import { In, IsNull } from 'typeorm'
import type { CohortPractice, PracticeList, PracticePolicy } from '@shared/api/practice'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  ScenarioEntity,
  UserEntity,
  type CohortRow,
  type UserRow,
} from '../entities'
import { HttpError } from '../http-error'
import { listScenarios } from '../scenarios/scenarios.service'
import { closingCohort, readPolicy, storedPolicy } from './practice-policy'
import { presentCohortPractice, type PracticeAttemptFact } from './practice.presenter'

async function cohortsOfApprentice(ctx: AppContext, userId: string): Promise<CohortRow[]> {
  const enrolments = await ctx.dataSource.getRepository(EnrollmentEntity).findBy({ userId })
  if (!enrolments.length) return []
  return ctx.dataSource.getRepository(CohortEntity).findBy({ id: In(enrolments.map((e) => e.cohortId)) })
}

/** Staff may practise (try) anything; an apprentice what none of their cohorts has closed. */
export async function practiceList(ctx: AppContext, user: UserRow): Promise<PracticeList> {
  const all = await listScenarios(ctx, user, { includeRetired: false })
  if (user.role !== 'apprentice') return { items: all, closed: 0 }
  const cohorts = await cohortsOfApprentice(ctx, user.id)
  const items = all.filter((s) => closingCohort(cohorts, s.key) === null)
  return { items, closed: all.length - items.length }
}

/** Throws the refusal an apprentice sees when practice of `key` is closed for them. */
export async function assertPracticeOpen(ctx: AppContext, user: UserRow, key: string, title: string) {
  if (user.role !== 'apprentice') return
  const cohort = closingCohort(await cohortsOfApprentice(ctx, user.id), key)
  if (cohort === null) return
  throw new HttpError(
    403,
    'practice_closed',
    `Free practice of “${title}” is closed for ${cohort}: your instructor may be assessing it. Ask them, or practise another exercise.`,
  )
}

export async function checkPracticeOpen(ctx: AppContext, user: UserRow, key: string) {
  const scenario = await ctx.dataSource
    .getRepository(ScenarioEntity)
    .findOne({ where: { key }, order: { version: 'DESC' } })
  if (!scenario || (scenario.status === 'retired' && user.role === 'apprentice')) {
    throw new HttpError(404, 'not_found', 'Scenario not found')
  }
  await assertPracticeOpen(ctx, user, key, scenario.title)
  return { key, open: true as const }
}

export async function cohortPractice(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<CohortPractice> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const ds = ctx.dataSource
  const userIds = (await ds.getRepository(EnrollmentEntity).findBy({ cohortId })).map((e) => e.userId)
  const members = userIds.length
    ? await ds
        .getRepository(UserEntity)
        .find({ select: { id: true, name: true }, where: { id: In(userIds) } })
    : []
  // Event logs stay in the database: only the columns counted are read.
  const rows = userIds.length
    ? await ds.getRepository(AttemptEntity).find({
        select: { userId: true, scenarioId: true, status: true, passed: true, updatedAt: true },
        where: { assignmentId: IsNull(), userId: In(userIds) },
      })
    : []
  const versionIds = [...new Set(rows.map((r) => r.scenarioId))]
  const keyOf = new Map(
    (versionIds.length
      ? await ds
          .getRepository(ScenarioEntity)
          .find({ select: { id: true, key: true }, where: { id: In(versionIds) } })
      : []
    ).map((v) => [v.id, v.key]),
  )
  const attempts: PracticeAttemptFact[] = rows.map((r) => ({
    userId: r.userId,
    key: keyOf.get(r.scenarioId) ?? '',
    status: r.status,
    passed: r.passed,
    updatedAt: r.updatedAt,
  }))
  const scenarios = await listScenarios(ctx, user, { includeRetired: false })
  return presentCohortPractice(
    cohort.id,
    readPolicy(cohort),
    scenarios,
    members.map((m) => ({ userId: m.id, name: m.name })),
    attempts,
  )
}

/** Keys must name scenarios in the library; an unknown one is the client's mistake. */
export async function setCohortPractice(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  policy: PracticePolicy,
): Promise<CohortPractice> {
  await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  if (policy.mode === 'chosen' && policy.keys.length) {
    const known = new Set(
      (
        await ctx.dataSource
          .getRepository(ScenarioEntity)
          .find({ select: { key: true }, where: { key: In(policy.keys) } })
      ).map((r) => r.key),
    )
    const unknown = policy.keys.filter((k) => !known.has(k))
    if (unknown.length) {
      throw new HttpError(400, 'validation_failed', 'Some scenarios are not in the library', {
        fields: { keys: [`Not in the library: ${unknown.join(', ')}`] },
      })
    }
  }
  await ctx.dataSource
    .getRepository(CohortEntity)
    .update({ id: cohortId }, { practiceKeys: storedPolicy(policy) })
  return cohortPractice(ctx, user, cohortId)
}
