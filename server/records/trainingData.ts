// Reads what one apprentice's training record shows, within a scope of cohorts: the exercises set in them
// (and practised, when the scope includes practice), the submitted attempts, the sign-offs. A fixed number
// of queries however long the record. Attempts are numbered over all the apprentice's submitted attempts
// on an exercise, so "Attempt 3" means the same on every record and screen.
import { In, IsNull, type DataSource } from 'typeorm'
import { gradeResultSchema, type GradeResult } from '@shared/api/grading'
import type { Scenario } from '@shared/scenario'
import { ATTEMPT_SUMMARY_SELECT } from '../attempts/attempts.service'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  OutcomeSignOffEntity,
  OutcomeSignOffWithdrawalEntity,
  ScenarioEntity,
  UserEntity,
  type AttemptRow,
  type CohortRow,
  type OutcomeSignOffRow,
  type OutcomeSignOffWithdrawalRow,
  type ScenarioRow,
  type UserRow,
} from '../entities'

export interface TrainingScope {
  cohortIds: string[]
  /** Free practice (attempts on no assignment): shown to the apprentice and to admins only. */
  includePractice: boolean
}

export type RecordAttempt = Omit<AttemptRow, 'events'> & { label: string; grade: GradeResult | null }

export interface TrainingData {
  apprentice: UserRow
  cohorts: CohortRow[]
  /** Every scenario version the record mentions, by id. */
  scenarios: Map<string, ScenarioRow & { parsed: Scenario }>
  /** The exercises set in the scope's cohorts, newest version of each key first met. */
  assignedScenarioIds: string[]
  attempts: RecordAttempt[]
  signOffs: OutcomeSignOffRow[]
  /** Sign-offs withdrawn in the scope's cohorts, oldest first. */
  withdrawals: OutcomeSignOffWithdrawalRow[]
  /** Names of everyone who signed off, withdrew a sign-off or owns a cohort in scope, by id. */
  names: Map<string, string>
}

function parseGrade(evidence: string | null): GradeResult | null {
  if (!evidence) return null
  const parsed = gradeResultSchema.safeParse(JSON.parse(evidence))
  return parsed.success ? parsed.data : null
}

/** "Attempt n" by submission order per exercise (scenario key), with practice marked. */
export function attemptLabels(
  attempts: Pick<AttemptRow, 'id' | 'assignmentId' | 'submittedAt'>[],
  keyOf: (attempt: Pick<AttemptRow, 'id'>) => string,
): Map<string, string> {
  const counts = new Map<string, number>()
  const labels = new Map<string, string>()
  const ordered = [...attempts].sort((a, b) => (a.submittedAt ?? '').localeCompare(b.submittedAt ?? ''))
  for (const attempt of ordered) {
    const key = keyOf(attempt)
    const n = (counts.get(key) ?? 0) + 1
    counts.set(key, n)
    labels.set(attempt.id, attempt.assignmentId ? `Attempt ${n}` : `Attempt ${n} (practice)`)
  }
  return labels
}

/** Labels of all the apprentice's submitted attempts (their scenario keys read alongside). */
export async function labelsOfApprentice(ds: DataSource, apprenticeId: string) {
  const all = await ds.getRepository(AttemptEntity).find({
    where: { userId: apprenticeId, status: 'submitted' },
    select: { id: true, assignmentId: true, scenarioId: true, submittedAt: true },
  })
  const versions = all.length
    ? await ds.getRepository(ScenarioEntity).find({
        where: { id: In([...new Set(all.map((a) => a.scenarioId))]) },
        select: { id: true, key: true },
      })
    : []
  const keyOfScenario = new Map(versions.map((v) => [v.id, v.key]))
  const scenarioOf = new Map(all.map((a) => [a.id, a.scenarioId]))
  return attemptLabels(all, (a) => keyOfScenario.get(scenarioOf.get(a.id)!) ?? '')
}

export async function loadTrainingData(
  ds: DataSource,
  apprentice: UserRow,
  scope: TrainingScope,
): Promise<TrainingData> {
  const cohorts = scope.cohortIds.length
    ? await ds
        .getRepository(CohortEntity)
        .find({ where: { id: In(scope.cohortIds) }, order: { name: 'ASC' } })
    : []
  const assignments = cohorts.length
    ? await ds.getRepository(AssignmentEntity).find({
        where: { cohortId: In(cohorts.map((c) => c.id)) },
        order: { opensAt: 'ASC' },
      })
    : []
  const inScope = [
    ...(assignments.length ? [{ assignmentId: In(assignments.map((a) => a.id)) }] : []),
    ...(scope.includePractice ? [{ assignmentId: IsNull() }] : []),
  ]
  const rows = inScope.length
    ? await ds.getRepository(AttemptEntity).find({
        where: inScope.map((w) => ({ ...w, userId: apprentice.id, status: 'submitted' as const })),
        select: ATTEMPT_SUMMARY_SELECT,
        order: { submittedAt: 'ASC' },
      })
    : []
  const scenarioIds = [
    ...new Set([...assignments.map((a) => a.scenarioId), ...rows.map((r) => r.scenarioId)]),
  ]
  const scenarioRows = scenarioIds.length
    ? await ds.getRepository(ScenarioEntity).findBy({ id: In(scenarioIds) })
    : []
  const scenarios = new Map(
    scenarioRows.map((row) => [row.id, { ...row, parsed: JSON.parse(row.document) as Scenario }]),
  )
  const labels = await labelsOfApprentice(ds, apprentice.id)
  const signOffs = cohorts.length
    ? await ds.getRepository(OutcomeSignOffEntity).find({
        where: { apprenticeId: apprentice.id, cohortId: In(cohorts.map((c) => c.id)) },
        order: { signedAt: 'ASC' },
      })
    : []
  const withdrawals = cohorts.length
    ? await ds.getRepository(OutcomeSignOffWithdrawalEntity).find({
        where: { apprenticeId: apprentice.id, cohortId: In(cohorts.map((c) => c.id)) },
        order: { withdrawnAt: 'ASC' },
      })
    : []
  const peopleIds = [
    ...new Set([
      ...signOffs.map((s) => s.signedById),
      ...withdrawals.flatMap((w) => [w.signedById, w.withdrawnById]),
      ...cohorts.map((c) => c.ownerId),
    ]),
  ]
  const people = peopleIds.length
    ? await ds
        .getRepository(UserEntity)
        .find({ where: { id: In(peopleIds) }, select: { id: true, name: true } })
    : []
  return {
    apprentice,
    cohorts,
    scenarios,
    assignedScenarioIds: [...new Set(assignments.map((a) => a.scenarioId))],
    attempts: rows.map((row) => ({
      ...row,
      label: labels.get(row.id) ?? 'Attempt',
      grade: parseGrade(row.evidence),
    })),
    signOffs,
    withdrawals,
    names: new Map(people.map((p) => [p.id, p.name])),
  }
}
