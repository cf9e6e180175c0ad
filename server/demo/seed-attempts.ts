// Sample attempts for the demo: the fixture logs in tests/fixtures/attempts, replayed and graded by the
// real grader, with one instructor comment and one audited override so every screen has something to show.
import { randomUUID } from 'node:crypto'
import { existsSync, readFileSync } from 'node:fs'
import type { DataSource } from 'typeorm'
import { attemptLogSchema } from '@shared/model/events'
import type { Scenario } from '@shared/scenario/schema'
import {
  AttemptEntity,
  AuditEntryEntity,
  FeedbackEntity,
  ScenarioEntity,
  type AssignmentRow,
  type AttemptRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { DAY, HOUR } from '../infrastructure/clock'
import { ATTEMPT_FIXTURES_DIR } from '../infrastructure/paths'
import { DEMO_ACCOUNTS } from './demo-accounts'
import { gradeAttempt } from '../infrastructure/grading/grading'

export const FIXTURE_DIR = ATTEMPT_FIXTURES_DIR

/** [apprentice e-mail prefix, scenario key, fixture name, days ago, whether to leave it in progress]. */
const PLAN: [string, string, string, number, boolean?][] = [
  ['ravi.lindqvist', 'safe-isolation', 'reference', 12],
  ['ffion.achterberg', 'safe-isolation', 'mistake-no-lock', 11],
  ['ffion.achterberg', 'safe-isolation', 'reference', 9],
  ['callum.oyelaran', 'safe-isolation', 'mistake-bus-measured-too-soon', 10],
  ['zofia.brennock', 'safe-isolation', 'reference', 8],
  ['ravi.lindqvist', 'two-wire-run-stop', 'reference', 4],
  ['ffion.achterberg', 'two-wire-run-stop', 'mistake-not-proved-dead', 3],
  ['tomasz.quarrie', 'two-wire-run-stop', 'reference', 2, true],
  ['ravi.lindqvist', 'raise-lower-commissioning', 'reference-with-hint', 1],
  ['nkem.halvorsen', 'safe-isolation', 'reference', 5],
  ['isla.varga.pemberton', 'safe-isolation', 'mistake-no-lock', 4],
  ['dario.fenwick.asante', 'safe-isolation', 'reference', 3],
  ['nkem.halvorsen', 'three-wire-start-stop', 'reference', 1],
  ['saoirse.mulrooney', 'three-wire-start-stop', 'mistake-not-proved-dead', 1],
]

export async function seedSampleAttempts(
  ds: DataSource,
  users: UserRow[],
  cohorts: CohortRow[],
  assignments: AssignmentRow[],
): Promise<number> {
  if (!existsSync(FIXTURE_DIR)) return 0
  const scenarios = await ds.getRepository(ScenarioEntity).find()
  const rows: AttemptRow[] = []
  for (const [person, key, fixture, daysAgo, inProgress] of PLAN) {
    const file = `${FIXTURE_DIR}/${key}--${fixture}.json`
    const user = users.find((u) => u.email.startsWith(`${person}@`))
    const scenario = scenarios.find((s) => s.key === key)
    const cohortIndex = DEMO_ACCOUNTS.find((a) => a.email.startsWith(`${person}@`))?.cohort
    const cohort = cohortIndex === undefined ? undefined : cohorts[cohortIndex]
    const target = assignments.find((a) => a.scenarioId === scenario?.id && a.cohortId === cohort?.id)
    if (!user || !scenario || !target || !existsSync(file)) continue
    const events = attemptLogSchema.parse(
      (JSON.parse(readFileSync(file, 'utf8')) as { events: unknown }).events,
    )
    const at = new Date(Date.now() - daysAgo * DAY)
    const startedAt = new Date(at.getTime() - HOUR / 2).toISOString()
    const kept = inProgress ? events.slice(0, Math.ceil(events.length / 2)) : events
    const grade = inProgress
      ? null
      : gradeAttempt(JSON.parse(scenario.document) as Scenario, kept, target.assistanceLevel)
    rows.push({
      id: randomUUID(),
      userId: user.id,
      assignmentId: target.id,
      scenarioId: scenario.id,
      status: inProgress ? 'inProgress' : 'submitted',
      assistanceLevel: target.assistanceLevel,
      events: JSON.stringify(kept),
      eventCount: kept.length,
      late: !inProgress && at.toISOString() > target.dueAt,
      startedAt,
      updatedAt: at.toISOString(),
      submittedAt: inProgress ? null : at.toISOString(),
      autoScore: grade?.score ?? null,
      autoPassed: grade?.passed ?? null,
      score: grade?.score ?? null,
      passed: grade?.passed ?? null,
      evidence: grade ? JSON.stringify(grade.evidence) : null,
      gradedAt: grade ? at.toISOString() : null,
      reviewedAt: null,
      reviewedById: null,
      overriddenAt: null,
      overrideReason: null,
    })
  }
  await ds.transaction(async (manager) => {
    if (rows.length) await manager.getRepository(AttemptEntity).insert(rows)
    await manager.getRepository(AuditEntryEntity).insert(
      rows
        .filter((r) => r.score !== null)
        .map((r) => ({
          id: randomUUID(),
          actorId: null,
          action: 'grade.graded',
          entityType: 'attempt',
          entityId: r.id,
          fromValue: null,
          toValue: JSON.stringify({ score: r.score, passed: r.passed }),
          reason: 'Graded by replaying the event log',
          createdAt: r.gradedAt!,
        })),
    )
    const instructor = users.find((u) => u.role === 'instructor')
    const failed = rows.find((r) => r.status === 'submitted' && !r.passed)
    if (instructor && failed) {
      await manager.getRepository(FeedbackEntity).insert({
        id: randomUUID(),
        attemptId: failed.id,
        authorId: instructor.id,
        body: 'Good start. Before touching any terminal: lock the disconnect and prove every pair dead, DC bus included.',
        createdAt: failed.updatedAt,
      })
      await manager
        .getRepository(AttemptEntity)
        .update({ id: failed.id }, { reviewedAt: failed.updatedAt, reviewedById: instructor.id })
    }
    const reviewed = rows.find(
      (r) => r.status === 'submitted' && r.passed && r.score !== null && r.score < 100,
    )
    if (instructor && reviewed) {
      const next = { score: Math.min(100, reviewed.score! + 5), passed: true }
      const reason = 'Explained the hint correctly at the bench; marks restored.'
      const overriddenAt = new Date(Date.parse(reviewed.updatedAt) + HOUR).toISOString()
      await manager.getRepository(AttemptEntity).update(
        { id: reviewed.id },
        {
          ...next,
          overriddenAt,
          overrideReason: reason,
          reviewedAt: overriddenAt,
          reviewedById: instructor.id,
        },
      )
      await manager.getRepository(AuditEntryEntity).insert({
        id: randomUUID(),
        actorId: instructor.id,
        action: 'grade.overridden',
        entityType: 'attempt',
        entityId: reviewed.id,
        fromValue: JSON.stringify({ score: reviewed.score, passed: reviewed.passed }),
        toValue: JSON.stringify(next),
        reason,
        createdAt: overriddenAt,
      })
    }
  })
  return rows.length
}
