// The records' rules: who may download which record, what goes in it, and the sign-off of an outcome.
// Loading is in trainingData.ts, shaping in records.presenter.ts and commissioningView.ts, bytes in the
// PDF builders (pure) and archive.ts.
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import type { AttemptEvent } from '@shared/model'
import { gradeResultSchema } from '@shared/api/grading'
import type {
  CommissioningRecord,
  OutcomeSignOff,
  SignOffRequest,
  SignOffWithdrawalRequest,
  TrainingRecordQuery,
  TrainingRecordSummary,
  WithdrawnSignOff,
} from '@shared/api/records'
import { scenarioSchema } from '@shared/scenario'
import { attemptFor, cohortFor, taughtCohortIds } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AuditEntryEntity,
  CohortEntity,
  EnrollmentEntity,
  FeedbackEntity,
  OutcomeSignOffEntity,
  OutcomeSignOffWithdrawalEntity,
  ScenarioEntity,
  UserEntity,
  type OutcomeSignOffRow,
  type OutcomeSignOffWithdrawalRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict, forbidden, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { zipFiles } from './archive'
import { buildCommissioningView } from './commissioningView'
import { commissioningRecordPdf } from './commissioningRecord'
import {
  fileSlug,
  presentCommissioningRecord,
  presentSignOff,
  presentTrainingSummary,
  presentWithdrawnSignOff,
  trainingRecordView,
} from './records.presenter'
import { labelsOfApprentice, loadTrainingData, type TrainingScope } from './trainingData'
import { trainingRecordPdf } from './trainingRecord'
import type { CommissioningRecordView, RecordCentre } from './types'
import { presentCentreSettings } from '../centre/centre.presenter'
import { readCentreSettings } from '../centre/centre.service'

export interface RecordFile {
  fileName: string
  bytes: Buffer
}

/** The centre as its admin set it (Centre settings): its name heads the records, its clock dates them. */
async function centreOf(ctx: AppContext): Promise<RecordCentre> {
  const { name, timeZone } = presentCentreSettings(await readCentreSettings(ctx.dataSource))
  return { name, timeZone }
}

const notReady = (message: string) => conflict('conflict', message)

/** The commissioning record's view model of one submitted attempt, for whoever may read the attempt. */
async function commissioningRecordView(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<{ view: CommissioningRecordView; fileName: string }> {
  const ds = ctx.dataSource
  const attempt = await attemptFor(ds, user, attemptId, 'read')
  if (attempt.status !== 'submitted') {
    throw notReady('This attempt has not been submitted yet: its commissioning record is made at submission')
  }
  const grade = attempt.evidence ? gradeResultSchema.safeParse(JSON.parse(attempt.evidence)) : null
  if (!grade?.success) throw notReady('This attempt has not been graded yet; try again in a moment')
  const scenarioRow = await ds.getRepository(ScenarioEntity).findOneByOrFail({ id: attempt.scenarioId })
  const scenario = scenarioSchema.parse(JSON.parse(scenarioRow.document))
  const apprentice = await ds.getRepository(UserEntity).findOneByOrFail({ id: attempt.userId })
  const assignment = attempt.assignmentId
    ? await ds.getRepository(AssignmentEntity).findOneBy({ id: attempt.assignmentId })
    : null
  const cohort = assignment
    ? await ds.getRepository(CohortEntity).findOneBy({ id: assignment.cohortId })
    : null
  const feedback = await ds
    .getRepository(FeedbackEntity)
    .find({ where: { attemptId: attempt.id }, order: { createdAt: 'ASC' } })
  const overrides = await ds.getRepository(AuditEntryEntity).find({
    where: { entityType: 'attempt', entityId: attempt.id, action: 'grade.overridden' },
    order: { createdAt: 'ASC' },
  })
  const lastOverride = overrides.at(-1)
  const peopleIds = [
    ...feedback.map((f) => f.authorId),
    ...(lastOverride?.actorId ? [lastOverride.actorId] : []),
    ...(cohort ? [cohort.ownerId] : []),
  ]
  const people = peopleIds.length ? await ds.getRepository(UserEntity).findBy({ id: In(peopleIds) }) : []
  const nameOf = (id: string | null) => people.find((p) => p.id === id)?.name ?? 'An instructor'
  const label = (await labelsOfApprentice(ds, apprentice.id)).get(attempt.id) ?? 'Attempt'
  const view = buildCommissioningView({
    centre: await centreOf(ctx),
    scenario,
    events: JSON.parse(attempt.events) as AttemptEvent[],
    grade: grade.data,
    apprentice: { name: apprentice.name },
    instructor: cohort ? { name: nameOf(cohort.ownerId) } : null,
    attempt: {
      label,
      startedAt: attempt.startedAt,
      submittedAt: attempt.submittedAt,
      assistance: attempt.assistanceLevel,
    },
    review: {
      feedback: feedback.map((f) => ({ author: nameOf(f.authorId), at: f.createdAt, body: f.body })),
      override:
        lastOverride && lastOverride.fromValue
          ? {
              by: nameOf(lastOverride.actorId),
              at: lastOverride.createdAt,
              from: JSON.parse(lastOverride.fromValue),
              to: JSON.parse(lastOverride.toValue),
              reason: lastOverride.reason,
            }
          : null,
    },
    generatedAt: nowIso(),
  })
  const attemptNumber = label.replace(/\D+/g, '') || '1'
  return {
    view,
    fileName: `commissioning-record-${fileSlug(scenarioRow.key)}-attempt-${attemptNumber}-${fileSlug(apprentice.name)}.pdf`,
  }
}

export async function commissioningRecordFile(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<RecordFile> {
  const { view, fileName } = await commissioningRecordView(ctx, user, attemptId)
  return { fileName, bytes: await commissioningRecordPdf(view) }
}

/** The same record as JSON, for the browser's print view. */
export async function commissioningRecordJson(
  ctx: AppContext,
  user: UserRow,
  attemptId: string,
): Promise<CommissioningRecord> {
  return presentCommissioningRecord((await commissioningRecordView(ctx, user, attemptId)).view)
}

async function apprenticeById(ctx: AppContext, id: string): Promise<UserRow> {
  const apprentice = await ctx.dataSource.getRepository(UserEntity).findOneBy({ id })
  if (!apprentice || apprentice.role !== 'apprentice') throw notFound('Apprentice')
  return apprentice
}

const notInCohort = () => new HttpError(404, 'not_found', 'This apprentice is not in that cohort')

/**
 * The cohorts (and practice) a caller may see of an apprentice's record: their own record, whole; an
 * admin, the whole record; an instructor, the cohorts they teach that the apprentice is in.
 */
async function trainingScope(
  ctx: AppContext,
  user: UserRow,
  apprentice: UserRow,
  query: TrainingRecordQuery,
): Promise<TrainingScope> {
  const ds = ctx.dataSource
  if (user.role === 'apprentice' && user.id !== apprentice.id) throw forbidden('This record is not yours')
  const enrolled = (await ds.getRepository(EnrollmentEntity).findBy({ userId: apprentice.id })).map(
    (e) => e.cohortId,
  )
  if (query.cohortId) {
    await cohortFor(ds, user, query.cohortId, 'read')
    if (!enrolled.includes(query.cohortId)) throw notInCohort()
    return { cohortIds: [query.cohortId], includePractice: false }
  }
  if (user.role !== 'instructor') return { cohortIds: enrolled, includePractice: true }
  const mine = new Set(await taughtCohortIds(ds, user.id))
  const taught = enrolled.filter((id) => mine.has(id))
  if (taught.length === 0) throw forbidden('This apprentice is not in any of your cohorts')
  return { cohortIds: taught, includePractice: false }
}

export async function trainingRecordSummary(
  ctx: AppContext,
  user: UserRow,
  apprenticeId: string,
  query: TrainingRecordQuery,
): Promise<TrainingRecordSummary> {
  const apprentice = await apprenticeById(ctx, apprenticeId)
  const scope = await trainingScope(ctx, user, apprentice, query)
  return presentTrainingSummary(await loadTrainingData(ctx.dataSource, apprentice, scope))
}

async function trainingRecordBytes(ctx: AppContext, apprentice: UserRow, scope: TrainingScope) {
  const data = await loadTrainingData(ctx.dataSource, apprentice, scope)
  return trainingRecordPdf(trainingRecordView(data, await centreOf(ctx), nowIso()))
}

export async function trainingRecordFile(
  ctx: AppContext,
  user: UserRow,
  apprenticeId: string,
  query: TrainingRecordQuery,
): Promise<RecordFile> {
  const apprentice = await apprenticeById(ctx, apprenticeId)
  const scope = await trainingScope(ctx, user, apprentice, query)
  return {
    fileName: `training-record-${fileSlug(apprentice.name)}.pdf`,
    bytes: await trainingRecordBytes(ctx, apprentice, scope),
  }
}

/** Every enrolled apprentice's training record for this cohort, one PDF each, in one zip. */
export async function cohortTrainingRecordsZip(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
): Promise<RecordFile> {
  const ds = ctx.dataSource
  const cohort = await cohortFor(ds, user, cohortId, 'manage')
  const enrolments = await ds.getRepository(EnrollmentEntity).findBy({ cohortId: cohort.id })
  const apprentices = enrolments.length
    ? await ds
        .getRepository(UserEntity)
        .find({ where: { id: In(enrolments.map((e) => e.userId)) }, order: { name: 'ASC' } })
    : []
  if (apprentices.length === 0)
    throw notReady('This cohort has no apprentices yet: there are no records to download')
  const files: { name: string; bytes: Buffer }[] = []
  for (const apprentice of apprentices) {
    // One at a time: each PDF takes a moment of CPU, and the machine serves others meanwhile.
    files.push({
      name: `training-record-${fileSlug(apprentice.name)}.pdf`,
      bytes: await trainingRecordBytes(ctx, apprentice, { cohortIds: [cohort.id], includePractice: false }),
    })
  }
  return { fileName: `training-records-${fileSlug(cohort.name)}.zip`, bytes: await zipFiles(files) }
}

/** An instructor of the apprentice's cohort signs off one learning outcome of an exercise, with a note. */
export async function signOffOutcome(
  ctx: AppContext,
  user: UserRow,
  apprenticeId: string,
  request: SignOffRequest,
): Promise<OutcomeSignOff> {
  const ds = ctx.dataSource
  const apprentice = await apprenticeById(ctx, apprenticeId)
  const cohort = await cohortFor(ds, user, request.cohortId, 'manage')
  if (
    (await ds.getRepository(EnrollmentEntity).countBy({ cohortId: cohort.id, userId: apprentice.id })) === 0
  ) {
    throw notInCohort()
  }
  const versions = await ds.getRepository(ScenarioEntity).findBy({ key: request.scenarioKey })
  if (versions.length === 0) throw notFound('Exercise')
  const outcomes = new Set(
    versions.flatMap(
      (v) => (JSON.parse(v.document) as { learningOutcomes?: string[] }).learningOutcomes ?? [],
    ),
  )
  if (!outcomes.has(request.outcome)) {
    throw new HttpError(400, 'validation_failed', 'That exercise has no such learning outcome', {
      fields: { outcome: ['Choose one of the exercise’s learning outcomes'] },
    })
  }
  const existing = await ds.getRepository(OutcomeSignOffEntity).findOneBy({
    apprenticeId: apprentice.id,
    cohortId: cohort.id,
    scenarioKey: request.scenarioKey,
    outcome: request.outcome,
  })
  if (existing) throw notReady('This outcome is already signed off for this apprentice in this cohort')
  const row: OutcomeSignOffRow = {
    id: randomUUID(),
    apprenticeId: apprentice.id,
    cohortId: cohort.id,
    scenarioKey: request.scenarioKey,
    outcome: request.outcome,
    note: request.note,
    signedById: user.id,
    signedAt: nowIso(),
  }
  await ds.transaction(async (manager) => {
    await manager.getRepository(OutcomeSignOffEntity).insert(row)
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: user.id,
      action: 'outcome.signedOff',
      entityType: 'outcomeSignOff',
      entityId: row.id,
      fromValue: null,
      toValue: JSON.stringify({
        apprenticeId: apprentice.id,
        cohortId: cohort.id,
        scenarioKey: row.scenarioKey,
        outcome: row.outcome,
      }),
      reason: row.note,
      createdAt: row.signedAt,
    })
  })
  return presentSignOff(row, user.name)
}

/**
 * An instructor of the cohort (or an admin) withdraws a sign-off, saying why: the sign-off moves to the
 * withdrawals with who, when and the reason, and the act is audited, in one transaction. The outcome
 * reads "not signed off" again and may be signed off anew; the training record keeps the withdrawal.
 */
export async function withdrawSignOff(
  ctx: AppContext,
  user: UserRow,
  signOffId: string,
  request: SignOffWithdrawalRequest,
): Promise<WithdrawnSignOff> {
  const ds = ctx.dataSource
  const signOff = await ds.getRepository(OutcomeSignOffEntity).findOneBy({ id: signOffId })
  if (!signOff) {
    const earlier = await ds.getRepository(OutcomeSignOffWithdrawalEntity).findOneBy({ id: signOffId })
    if (earlier) {
      await cohortFor(ds, user, earlier.cohortId, 'manage')
      throw notReady('This sign-off has already been withdrawn')
    }
    throw notFound('Sign-off')
  }
  await cohortFor(ds, user, signOff.cohortId, 'manage')
  const row: OutcomeSignOffWithdrawalRow = {
    ...signOff,
    withdrawnById: user.id,
    withdrawnAt: nowIso(),
    reason: request.reason,
  }
  await ds.transaction(async (manager) => {
    // Only the transaction that removes the sign-off records its withdrawal (two clicks, one withdrawal).
    const removed = await manager.getRepository(OutcomeSignOffEntity).delete({ id: signOff.id })
    if (!removed.affected) throw notReady('This sign-off has already been withdrawn')
    await manager.getRepository(OutcomeSignOffWithdrawalEntity).insert(row)
    await manager.getRepository(AuditEntryEntity).insert({
      id: randomUUID(),
      actorId: user.id,
      action: 'outcome.signOffWithdrawn',
      entityType: 'outcomeSignOff',
      entityId: signOff.id,
      fromValue: JSON.stringify({
        apprenticeId: signOff.apprenticeId,
        cohortId: signOff.cohortId,
        scenarioKey: signOff.scenarioKey,
        outcome: signOff.outcome,
        signedById: signOff.signedById,
        signedAt: signOff.signedAt,
        note: signOff.note,
      }),
      toValue: JSON.stringify({ withdrawnById: row.withdrawnById, withdrawnAt: row.withdrawnAt }),
      reason: request.reason,
      createdAt: row.withdrawnAt,
    })
  })
  const people = await ds
    .getRepository(UserEntity)
    .find({ where: { id: In([row.signedById, row.withdrawnById]) }, select: { id: true, name: true } })
  return presentWithdrawnSignOff(row, new Map(people.map((p) => [p.id, p.name])))
}
