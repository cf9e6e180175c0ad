// Attempt submission: validate the target and the rules, grade on the server, store once (idempotent by id).
import { randomUUID } from 'node:crypto'
import { In } from 'typeorm'
import {
  ATTEMPT_DIVERGED,
  isLogPrefix,
  type SubmitAttemptRequest,
  type AttemptSummary,
  type GradeAuditEntry,
} from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model/events'
import { appLink, type AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  AuditEntryEntity,
  CohortEntity,
  ScenarioEntity,
  UserEntity,
  type AssignmentRow,
  type AttemptRow,
  type AuditEntryRow,
  type ScenarioRow,
  type UserRow,
} from '../entities'
import { HttpError, conflict } from '../http-error'
import { isEnrolled } from './access'
import { nowIso } from './clock'
import { findById } from './lookups'
import { attemptReviewedMail } from './mail-templates'

/** An attempt without its event log: everything a summary shows. */
export type AttemptSummaryRow = Omit<AttemptRow, 'events'>

/** TypeORM `select` for list routes: every column but the event log, which can run to megabytes. */
export const ATTEMPT_SUMMARY_SELECT = {
  id: true,
  userId: true,
  assignmentId: true,
  scenarioId: true,
  status: true,
  eventCount: true,
  late: true,
  startedAt: true,
  updatedAt: true,
  submittedAt: true,
  autoScore: true,
  autoPassed: true,
  score: true,
  passed: true,
  evidence: true,
  gradedAt: true,
} satisfies Record<keyof AttemptSummaryRow, true>

export async function presentAttempts(ctx: AppContext, rows: AttemptSummaryRow[]): Promise<AttemptSummary[]> {
  if (rows.length === 0) return []
  const ds = ctx.dataSource
  const users = await ds.getRepository(UserEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.userId))]) },
    select: { id: true, name: true },
  })
  const scenarios = await ds.getRepository(ScenarioEntity).find({
    where: { id: In([...new Set(rows.map((r) => r.scenarioId))]) },
    select: { id: true, key: true, version: true, title: true },
  })
  return rows.map((row) => {
    const scenario = scenarios.find((s) => s.id === row.scenarioId)!
    return {
      id: row.id,
      userId: row.userId,
      userName: users.find((u) => u.id === row.userId)?.name ?? '',
      assignmentId: row.assignmentId,
      scenarioId: row.scenarioId,
      scenarioKey: scenario.key,
      scenarioVersion: scenario.version,
      scenarioTitle: scenario.title,
      status: row.status,
      eventCount: row.eventCount,
      late: Boolean(row.late),
      startedAt: row.startedAt,
      updatedAt: row.updatedAt,
      submittedAt: row.submittedAt,
      grade:
        row.score === null || row.autoScore === null
          ? null
          : {
              score: row.score,
              passed: Boolean(row.passed),
              autoScore: row.autoScore,
              autoPassed: Boolean(row.autoPassed),
              overridden: row.score !== row.autoScore || Boolean(row.passed) !== Boolean(row.autoPassed),
              evidence: row.evidence ? JSON.parse(row.evidence) : null,
              gradedAt: row.gradedAt ?? row.submittedAt ?? row.updatedAt,
            },
    }
  })
}

export async function presentAudit(ctx: AppContext, rows: AuditEntryRow[]): Promise<GradeAuditEntry[]> {
  const actorIds = rows.map((r) => r.actorId).filter((id): id is string => id !== null)
  const actors = actorIds.length
    ? await ctx.dataSource.getRepository(UserEntity).findBy({ id: In(actorIds) })
    : []
  return rows.map((row) => ({
    id: row.id,
    actorId: row.actorId,
    actorName: row.actorId ? (actors.find((a) => a.id === row.actorId)?.name ?? '') : 'Slipway grader',
    action: row.action === 'grade.overridden' ? 'overridden' : 'graded',
    from: row.fromValue ? JSON.parse(row.fromValue) : null,
    to: JSON.parse(row.toValue),
    reason: row.reason,
    createdAt: row.createdAt,
  }))
}

interface Target {
  scenario: ScenarioRow
  assignment: AssignmentRow | null
}

async function resolveTarget(ctx: AppContext, user: UserRow, body: SubmitAttemptRequest): Promise<Target> {
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
  return { scenario, assignment: null }
}

function checkRules(assignment: AssignmentRow, events: AttemptEvent[], usedAttempts: number, now: string) {
  if (now < assignment.opensAt) {
    throw conflict('assignment_not_open', `This assignment opens at ${assignment.opensAt}`)
  }
  if (assignment.attemptLimit !== null && usedAttempts >= assignment.attemptLimit) {
    throw conflict(
      'attempt_limit_reached',
      `All ${assignment.attemptLimit} attempt(s) allowed have been used`,
    )
  }
  if (!assignment.hintsAllowed && events.some((e) => e.type === 'hint.revealed')) {
    throw new HttpError(400, 'hints_not_allowed', 'Hints are not allowed on this assignment', {
      fields: { events: ['Contains a revealed hint'] },
    })
  }
}

class LostRace extends Error {}

export interface SubmitResult {
  created: boolean
  attempt: AttemptRow
}

export async function submitAttempt(
  ctx: AppContext,
  user: UserRow,
  body: SubmitAttemptRequest,
): Promise<SubmitResult> {
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
    if (!isLogPrefix(JSON.parse(existing.events) as AttemptEvent[], body.events)) {
      throw conflict(
        ATTEMPT_DIVERGED,
        `This attempt was continued on another computer: the server holds ${existing.eventCount} actions that this copy does not match. Load the newer copy to go on.`,
      )
    }
  }
  const { scenario, assignment } = await resolveTarget(ctx, user, body)
  const now = nowIso()
  const events = body.events as AttemptEvent[]
  if (assignment) {
    const used = await attempts.countBy({ assignmentId: assignment.id, userId: user.id, status: 'submitted' })
    checkRules(assignment, events, used, now)
  }
  const submitting = body.status === 'submitted'
  // Serialised once: the row stores this text, and a grading thread parses it (cheaper than cloning
  // thousands of event objects across the thread boundary).
  const eventsJson = JSON.stringify(events)
  const grade = submitting ? await ctx.grading.grade(scenario, { events, json: eventsJson }) : null
  const row: AttemptRow = {
    id: body.id,
    userId: user.id,
    assignmentId: assignment?.id ?? null,
    scenarioId: scenario.id,
    status: body.status,
    events: eventsJson,
    eventCount: events.length,
    late: Boolean(assignment && submitting && now > assignment.dueAt),
    startedAt: existing?.startedAt ?? now,
    updatedAt: now,
    submittedAt: submitting ? now : null,
    autoScore: grade?.score ?? null,
    autoPassed: grade?.passed ?? null,
    score: grade?.score ?? null,
    passed: grade?.passed ?? null,
    evidence: grade ? JSON.stringify(grade.evidence) : null,
    gradedAt: grade ? now : null,
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
    })
  } catch (error) {
    // Two identical submissions racing: the loser returns the winner's stored result.
    const winner = await attempts.findOneBy({ id: body.id })
    if (
      error instanceof LostRace &&
      winner?.status === 'inProgress' &&
      !isLogPrefix(JSON.parse(winner.events), events)
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
  if (grade && assignment) {
    ctx.mailer.send(
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
  }
  return { created: !existing || submitting, attempt: row }
}
