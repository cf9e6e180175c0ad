// Attempt submission: read the body in a grading thread, check the target and the rules, grade in a thread,
// store once (idempotent by id).
import { randomUUID } from 'node:crypto'
import { ATTEMPT_DIVERGED, type AttemptSummary } from '@shared/api/attempts'
import { checkSubmission, personalTerms } from '@shared/progress'
import { DEFAULT_ASSISTANCE_LEVEL, type AssistanceLevel } from '@shared/scenario/assistance'
import { formatInZone } from '@shared/time/zone'
import { isEnrolled } from '../access/access.service'
import { centreTimeZone } from '../centre/centre.service'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  AuditEntryEntity,
  CohortEntity,
  ScenarioEntity,
  type AssignmentRow,
  type AttemptRow,
  type ScenarioRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { findById } from '../infrastructure/database/lookups'
import type { ReadSubmission } from '../infrastructure/grading/grading-pool'
import type { SubmissionHeader } from '../infrastructure/grading/grading-worker'
import { queueMail } from '../infrastructure/mail/mail-job'
import { attemptReviewedMail } from '../infrastructure/mail/templates'
import { checkLiveRecords } from '../live/live-checks'
import { endSession } from '../live/live-sessions.service'
import { queueScorePost } from '../lti/score-post-job'
import { apprenticeFacts, assignmentTerms } from '../gradebook/standings'
import { assertPracticeOpen } from '../practice/practice.service'
import { presentOne } from './attempts.service'
import { storedLogOpens } from './log-prefix'

interface Target {
  scenario: ScenarioRow
  assignment: AssignmentRow | null
}

async function resolveTarget(ctx: AppContext, user: UserRow, body: SubmissionHeader): Promise<Target> {
  const ds = ctx.dataSource
  if (body.assignmentId) {
    const assignment = await findById(ds, AssignmentEntity, body.assignmentId)
    if (!assignment) throw new HttpError(404, 'not_found', 'Assignment not found')
    if (!(await isEnrolled(ds, assignment.cohortId, user.id))) {
      throw new HttpError(403, 'forbidden', 'This assignment is not set for you')
    }
    const cohort = await findById(ds, CohortEntity, assignment.cohortId)
    if (cohort?.archived)
      throw conflict('cohort_archived', 'This cohort is archived; its assignments are closed')
    const scenario = await findById(ds, ScenarioEntity, assignment.scenarioId)
    if (!scenario) throw new Error(`assignment ${assignment.id} names a missing scenario version`)
    return { scenario, assignment }
  }
  const scenario = await findById(ds, ScenarioEntity, body.scenarioId!)
  if (!scenario) {
    throw new HttpError(400, 'validation_failed', 'No such scenario version', {
      fields: { scenarioId: ['No such scenario version'] },
    })
  }
  if (scenario.status === 'retired') throw conflict('scenario_retired', 'This scenario is retired')
  await assertPracticeOpen(ctx, user, scenario.key, scenario.title)
  return { scenario, assignment: null }
}

/**
 * The apprentice's own terms decide (shared/progress): their due date, allowance and the late policy.
 * Returns whether the work is late.
 */
async function checkRules(
  ctx: AppContext,
  user: UserRow,
  assignment: AssignmentRow,
  usedAttempts: number,
  now: string,
): Promise<boolean> {
  const facts = await apprenticeFacts(ctx.dataSource, [assignment], user.id)
  const terms = personalTerms(assignmentTerms(assignment), facts.facts(assignment, user.id))
  const check = checkSubmission(terms, now, usedAttempts)
  if (!check.ok) {
    const timeZone = await centreTimeZone(ctx.dataSource)
    switch (check.refusal) {
      case 'notAssigned':
        throw new HttpError(403, 'forbidden', check.message)
      case 'notOpen':
        throw conflict(
          'assignment_not_open',
          `This assignment opens on ${formatInZone(terms.opensAt, timeZone, 'dateTimeZone')}`,
        )
      case 'closed':
        throw conflict(
          'assignment_closed',
          `This assignment closed on ${formatInZone(terms.dueAt, timeZone, 'dateTimeZone')}; ask your instructor for an extension`,
        )
      case 'noAttemptsLeft':
        throw conflict('attempt_limit_reached', check.message)
    }
  }
  return check.late
}

/**
 * An assessment offers no hints, so a log that reveals one did not come from the panel at that level: it is
 * refused (and nothing is stored) rather than graded, so no grade ever stands on help the level forbids.
 */
function refuseHintsInAssessment(level: AssistanceLevel, hintRevealed: boolean, assigned: boolean): void {
  if (level !== 'assessment' || !hintRevealed) return
  const where = assigned ? 'this assignment (an assessment)' : 'an assessment'
  throw new HttpError(400, 'hints_not_allowed', `Hints are not allowed in ${where}`, {
    fields: { events: ['Contains a revealed hint'] },
  })
}

class LostRace extends Error {}

export interface SubmitResult {
  /** False when the same id was already stored: the answer is then the stored result (200, not 201). */
  created: boolean
  attempt: AttemptSummary
}

/**
 * `body`: the request body as received (null when no JSON was sent). A grading thread parses and validates it,
 * so a 2 MB log costs the event loop nothing; a bad body is the same 400 the shared schema gives anywhere.
 */
export async function submitAttempt(
  ctx: AppContext,
  user: UserRow,
  body: Uint8Array | null,
): Promise<SubmitResult> {
  const submission = await ctx.grading.read(body)
  const { created, attempt } = await storeSubmission(ctx, user, submission)
  return { created, attempt: await presentOne(ctx, attempt) }
}

async function storeSubmission(
  ctx: AppContext,
  user: UserRow,
  submission: ReadSubmission,
): Promise<{ created: boolean; attempt: AttemptRow }> {
  const { request: body, eventsJson } = submission
  const ds = ctx.dataSource
  const attempts = ds.getRepository(AttemptEntity)
  const existing = await findById(ds, AttemptEntity, body.id)
  if (existing) {
    if (existing.userId !== user.id) throw conflict('attempt_conflict', 'This attempt id is already in use')
    // A repeated submission: hand back what was stored, change nothing.
    if (existing.status === 'submitted') return { created: false, attempt: existing }
    const sameTarget = body.assignmentId
      ? existing.assignmentId === body.assignmentId
      : existing.assignmentId === null && existing.scenarioId === body.scenarioId
    if (!sameTarget)
      throw conflict('attempt_conflict', 'This attempt belongs to a different assignment or scenario')
    // Saves only append: a log that drops what is stored was made from an older copy elsewhere.
    if (!storedLogOpens(existing.events, eventsJson)) {
      throw conflict(
        ATTEMPT_DIVERGED,
        `This attempt was continued on another computer: the server holds ${existing.eventCount} actions that this copy does not match. Load the newer copy to go on.`,
      )
    }
  }
  const { scenario, assignment } = await resolveTarget(ctx, user, body)
  const now = nowIso()
  // Fixed at the first save: the assignment's level then, or the apprentice's choice for practice.
  const assistanceLevel: AssistanceLevel =
    existing?.assistanceLevel ??
    assignment?.assistanceLevel ??
    body.assistanceLevel ??
    DEFAULT_ASSISTANCE_LEVEL
  let late = false
  if (assignment) {
    const used = await attempts.countBy({ assignmentId: assignment.id, userId: user.id, status: 'submitted' })
    late = await checkRules(ctx, user, assignment, used, now)
  }
  refuseHintsInAssessment(assistanceLevel, submission.hintRevealed, assignment !== null)
  const submitting = body.status === 'submitted'
  // Live classroom: only what instructors really sent, and on submission everything they injected.
  await checkLiveRecords(ds, body.id, submission.live, submitting)
  const grade = submitting ? await ctx.grading.grade(scenario, eventsJson, assistanceLevel) : null
  const row: AttemptRow = {
    id: body.id,
    userId: user.id,
    assignmentId: assignment?.id ?? null,
    scenarioId: scenario.id,
    status: body.status,
    assistanceLevel,
    events: eventsJson,
    eventCount: submission.eventCount,
    late: submitting && late,
    startedAt: existing?.startedAt ?? now,
    updatedAt: now,
    submittedAt: submitting ? now : null,
    autoScore: grade?.score ?? null,
    autoPassed: grade?.passed ?? null,
    score: grade?.score ?? null,
    passed: grade?.passed ?? null,
    evidence: grade?.evidenceJson ?? null,
    gradedAt: grade ? now : null,
    reviewedAt: existing?.reviewedAt ?? null,
    reviewedById: existing?.reviewedById ?? null,
    overriddenAt: null,
    overrideReason: null,
  }
  try {
    await ds.transaction(async (manager) => {
      if (existing) {
        // Only a draft may change; if a racing request submitted it meanwhile, that one wins.
        // …and only the draft that was checked above: a save that landed meanwhile wins this one.
        const changed = await manager
          .getRepository(AttemptEntity)
          .update({ id: row.id, status: 'inProgress', updatedAt: existing.updatedAt }, row)
        if (!changed.affected) throw new LostRace()
      } else {
        await manager.getRepository(AttemptEntity).insert(row)
      }
      if (grade) {
        await manager.getRepository(AuditEntryEntity).insert({
          id: randomUUID(),
          actorId: null,
          action: 'grade.graded',
          entityType: 'attempt',
          entityId: row.id,
          fromValue: null,
          toValue: JSON.stringify({ score: grade.score, passed: grade.passed }),
          reason: 'Graded by replaying the event log',
          createdAt: now,
        })
      }
      if (grade && assignment) {
        await queueMail(
          manager,
          attemptReviewedMail({
            to: user.email,
            name: user.name,
            title: assignment.title,
            what: 'graded',
            score: Math.round(grade.score),
            passed: grade.passed,
            url: appLink(ctx, `/attempts/${row.id}`),
          }),
        )
        // A learning platform that links this assignment receives the grade (nothing happens otherwise).
        await queueScorePost(manager, { assignmentId: assignment.id, userId: user.id })
      }
    })
  } catch (error) {
    // Two identical submissions racing: the loser returns the winner's stored result.
    const winner = await attempts.findOneBy({ id: body.id })
    if (
      error instanceof LostRace &&
      winner?.status === 'inProgress' &&
      !storedLogOpens(winner.events, eventsJson)
    ) {
      throw conflict(
        ATTEMPT_DIVERGED,
        'This attempt was saved from another computer at the same moment. Load the newer copy to go on.',
      )
    }
    if (winner?.userId === user.id && (error instanceof LostRace || !existing))
      return { created: false, attempt: winner }
    throw error
  }
  // A submitted attempt's live session is over: watchers see it end, the class view lets it go.
  if (submitting) {
    await endSession(ctx, row.id).catch((error: unknown) =>
      ctx.log.warn({ err: error, attemptId: row.id }, 'the live session of a submitted attempt did not end'),
    )
  }
  return { created: !existing || submitting, attempt: row }
}
