// Class insight per assignment and per cohort: the rows read here, the counting in shared/insight.
import { In, type DataSource } from 'typeorm'
import type { AssignmentInsight, CohortInsight } from '@shared/api/insight'
import { assignmentInsight, cohortInsight, type InsightInput } from '@shared/insight/insight'
import { assignmentFor, cohortFor } from '../access/access.service'
import { objectivesOf, violationsOf } from '../attempts/evidence'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  EnrollmentEntity,
  ScenarioEntity,
  type AssignmentRow,
  type UserRow,
} from '../entities'
import { pairKey, standingsFor } from '../gradebook/standings'
import { nowIso } from '../infrastructure/clock'

/** Whom each assignment is set for (its cohort's members, less the excused and those it is not set for). */
async function inputsFor(ds: DataSource, assignments: AssignmentRow[]): Promise<InsightInput[]> {
  if (!assignments.length) return []
  const cohortIds = [...new Set(assignments.map((a) => a.cohortId))]
  const enrolments = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: In(cohortIds) })
  const membersOf = (a: AssignmentRow) =>
    enrolments.filter((e) => e.cohortId === a.cohortId).map((e) => e.userId)
  const standings = await standingsFor(ds, assignments, membersOf, nowIso())
  const scenarios = await ds.getRepository(ScenarioEntity).find({
    select: { id: true, document: true },
    where: { id: In([...new Set(assignments.map((a) => a.scenarioId))]) },
  })
  const objectivesOfScenario = new Map(
    scenarios.map((s) => {
      const doc = JSON.parse(s.document) as {
        objectives?: { id: string; title: string; required?: boolean }[]
      }
      return [
        s.id,
        (doc.objectives ?? []).map((o) => ({ id: o.id, title: o.title, required: Boolean(o.required) })),
      ]
    }),
  )
  // Event logs stay in the database: only what is counted is read.
  const attempts = await ds.getRepository(AttemptEntity).find({
    select: {
      assignmentId: true,
      userId: true,
      startedAt: true,
      submittedAt: true,
      passed: true,
      evidence: true,
    },
    where: { assignmentId: In(assignments.map((a) => a.id)), status: 'submitted' },
  })
  return assignments.map((a) => ({
    assignmentId: a.id,
    title: a.title,
    objectives: objectivesOfScenario.get(a.scenarioId) ?? [],
    setFor: membersOf(a).filter((userId) => {
      const status = standings.get(pairKey(a.id, userId))?.status
      return status !== 'excused' && status !== 'notAssigned'
    }),
    attempts: attempts
      .filter((t) => t.assignmentId === a.id)
      .map((t) => ({
        userId: t.userId,
        startedAt: t.startedAt,
        submittedAt: t.submittedAt,
        passed: t.passed,
        objectives: objectivesOf(t.evidence),
        violations: violationsOf(t.evidence).map((v) => v.kind),
      })),
  }))
}

export async function insightForAssignment(
  ctx: AppContext,
  user: UserRow,
  assignmentId: string,
): Promise<AssignmentInsight> {
  const { assignment } = await assignmentFor(ctx.dataSource, user, assignmentId, 'manage')
  const [input] = await inputsFor(ctx.dataSource, [assignment])
  return assignmentInsight(input!)
}

export async function insightForCohort(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<CohortInsight> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const assignments = await ctx.dataSource
    .getRepository(AssignmentEntity)
    .find({ where: { cohortId: cohort.id }, order: { dueAt: 'ASC', title: 'ASC' } })
  return cohortInsight(cohort.id, await inputsFor(ctx.dataSource, assignments))
}
