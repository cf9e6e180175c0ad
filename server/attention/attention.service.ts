// The instructor's "needs attention" list, across every cohort they teach (admins: every cohort), archived
// cohorts left out: attempts awaiting review, safety violations this week, work closing soon that some have
// not submitted, and work missed lately. A fixed number of queries whatever the number of cohorts.
import { In, IsNull, MoreThanOrEqual, type DataSource } from 'typeorm'
import {
  ATTENTION_CLOSING_HOURS,
  ATTENTION_MISSED_DAYS,
  ATTENTION_SAFETY_DAYS,
  type Attention,
} from '@shared/api/attention'
import { managedCohortIds } from '../access/access.service'
import type { AppContext } from '../context'
import {
  AssignmentEntity,
  AttemptEntity,
  CohortEntity,
  EnrollmentEntity,
  UserEntity,
  type AssignmentRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { violationsOf } from '../attempts/evidence'
import { DAY, HOUR, nowMs } from '../infrastructure/clock'
import { standingsFor, pairKey, type Standing } from '../gradebook/standings'
import { presentAttentionAttempt, presentAttentionWork, type AttentionContext } from './attention.presenter'

const REVIEW_LIST_MAX = 50

/** The cohorts in view and their assignments. */
async function scope(ds: DataSource, user: UserRow) {
  const ids = await managedCohortIds(ds, user)
  const cohorts = await ds
    .getRepository(CohortEntity)
    .find({ where: { ...(ids ? { id: In(ids) } : {}), archived: false } })
  const assignments = cohorts.length
    ? await ds.getRepository(AssignmentEntity).findBy({ cohortId: In(cohorts.map((c) => c.id)) })
    : []
  return { cohorts, assignments }
}

const ATTEMPT_COLUMNS = {
  id: true,
  userId: true,
  assignmentId: true,
  submittedAt: true,
  score: true,
  passed: true,
  late: true,
} as const

export async function attentionFor(ctx: AppContext, user: UserRow): Promise<Attention> {
  const ds = ctx.dataSource
  const now = nowMs()
  const generatedAt = new Date(now).toISOString()
  const { cohorts, assignments } = await scope(ds, user)
  if (!assignments.length) {
    return {
      awaitingReview: { items: [], total: 0 },
      safetyViolations: [],
      closingSoon: [],
      missed: [],
      generatedAt,
    }
  }
  const assignmentIds = assignments.map((a) => a.id)
  const attempts = ds.getRepository(AttemptEntity)
  const [awaiting, total] = await attempts.findAndCount({
    where: { assignmentId: In(assignmentIds), status: 'submitted', reviewedAt: IsNull() },
    select: ATTEMPT_COLUMNS,
    order: { submittedAt: 'DESC' },
    take: REVIEW_LIST_MAX,
  })
  const thisWeek = await attempts.find({
    where: {
      assignmentId: In(assignmentIds),
      status: 'submitted',
      submittedAt: MoreThanOrEqual(new Date(now - ATTENTION_SAFETY_DAYS * DAY).toISOString()),
    },
    select: { ...ATTEMPT_COLUMNS, evidence: true },
    order: { submittedAt: 'DESC' },
  })
  const unsafe = thisWeek
    .map((row) => ({ row, violations: violationsOf(row.evidence) }))
    .filter((u) => u.violations.length > 0)

  // Standings on work whose due date is near: closing soon, or missed lately (extensions included).
  const enrolments = await ds
    .getRepository(EnrollmentEntity)
    .find({ where: { cohortId: In(cohorts.map((c) => c.id)) }, select: { cohortId: true, userId: true } })
  const members = new Map<string, string[]>()
  for (const e of enrolments) members.set(e.cohortId, [...(members.get(e.cohortId) ?? []), e.userId])
  const windowStart = now - ATTENTION_MISSED_DAYS * DAY
  const nearDue = assignments.filter((a) => Date.parse(a.dueAt) >= windowStart - ATTENTION_MISSED_DAYS * DAY)
  const standings = await standingsFor(ds, nearDue, (a) => members.get(a.cohortId) ?? [], generatedAt)
  const closing: [AssignmentRow, string, Standing][] = []
  const missed: [AssignmentRow, string, Standing][] = []
  for (const assignment of nearDue) {
    for (const userId of members.get(assignment.cohortId) ?? []) {
      const s = standings.get(pairKey(assignment.id, userId))!
      const due = s.terms.dueAt === null ? null : Date.parse(s.terms.dueAt)
      if (due === null) continue
      const open = s.status === 'notStarted' || s.status === 'inProgress'
      if (open && due > now && due <= now + ATTENTION_CLOSING_HOURS * HOUR)
        closing.push([assignment, userId, s])
      if (s.status === 'missed' && due >= windowStart) missed.push([assignment, userId, s])
    }
  }

  const userIds = new Set([
    ...awaiting.map((a) => a.userId),
    ...unsafe.map((u) => u.row.userId),
    ...closing.map(([, id]) => id),
    ...missed.map(([, id]) => id),
  ])
  const names = userIds.size
    ? await ds
        .getRepository(UserEntity)
        .find({ where: { id: In([...userIds]) }, select: { id: true, name: true } })
    : []
  const context: AttentionContext = {
    userName: new Map(names.map((u) => [u.id, u.name])),
    assignment: new Map(assignments.map((a) => [a.id, a])),
    cohort: new Map<string, CohortRow>(cohorts.map((c) => [c.id, c])),
  }
  return {
    awaitingReview: { items: awaiting.map((row) => presentAttentionAttempt(row, context)), total },
    safetyViolations: unsafe.map(({ row, violations }) => ({
      ...presentAttentionAttempt(row, context),
      violations: violations.map((v) => ({ kind: v.label, text: v.text })),
    })),
    closingSoon: presentAttentionWork(closing, context),
    missed: presentAttentionWork(missed, context),
    generatedAt,
  }
}
