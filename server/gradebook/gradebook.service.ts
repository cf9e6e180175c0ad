// The gradebook of a cohort: every apprentice × every assignment (loadGradebook, from the database), then
// filtered and sorted (viewGradebook, pure); gradebook-cache.ts keeps both between requests. Instructors
// read it a page at a time (gradebookPage) or whole as CSV (gradebookCsvFile).
import type { DataSource } from 'typeorm'
import { In, IsNull, Not } from 'typeorm'
import type {
  GradebookAssignment,
  GradebookCell,
  GradebookCellStatus,
  GradebookRow,
} from '@shared/api/gradebook'
import { WORK_STATUS_LABELS, personalTerms, summarise } from '@shared/progress'
import {
  AssignmentEntity,
  AttemptEntity,
  EnrollmentEntity,
  UserEntity,
  type CohortRow,
  type UserRow,
} from '../entities'
import { cohortFor } from '../access/access.service'
import { centreTimeZone } from '../centre/centre.service'
import type { AppContext } from '../context'
import { passRulesOf, UNKNOWN_RULE } from '../scenarios/pass-rules'
import { nowIso } from '../infrastructure/clock'
import type { GradebookPageBody, GradebookPageQuery } from './gradebook-cache'
import { gradebookCsv, gradebookFileName } from './gradebook.presenter'
import { NO_TALLY, apprenticeFacts, assignmentTerms, attemptTallies, pairKey, standingOf } from './standings'
import { shownEmail } from '@shared/api/users'

export interface GradebookFilter {
  sort: string
  order: 'asc' | 'desc'
  q?: string
  status?: GradebookCellStatus
  assignmentId?: string
}

export interface CohortGradebook {
  assignments: GradebookAssignment[]
  /** One row per enrolled apprentice, in no particular order. */
  rows: GradebookRow[]
  /**
   * Statuses were computed at load time and hold until the next personal due date passes (ms since the
   * epoch; Infinity when none is ahead): then work turns missed, so the cache must build it again.
   */
  validUntil: number
}

/** The reason of the latest override per pair (overrides are few: read apart from the covering index). */
async function overrideReasons(ds: DataSource, assignmentIds: string[]) {
  const rows = assignmentIds.length
    ? await ds.getRepository(AttemptEntity).find({
        where: { assignmentId: In(assignmentIds), overriddenAt: Not(IsNull()) },
        select: { assignmentId: true, userId: true, overrideReason: true, overriddenAt: true },
        order: { overriddenAt: 'ASC' },
      })
    : []
  return new Map(rows.map((r) => [pairKey(r.assignmentId!, r.userId), r.overrideReason ?? '']))
}

export async function loadGradebook(
  ds: DataSource,
  cohort: CohortRow,
  now: string = nowIso(),
): Promise<CohortGradebook> {
  const assignmentRows = await ds
    .getRepository(AssignmentEntity)
    .find({ where: { cohortId: cohort.id }, order: { dueAt: 'ASC' } })
  const enrollments = await ds
    .getRepository(EnrollmentEntity)
    .find({ where: { cohortId: cohort.id }, select: { userId: true } })
  // Only the columns a row shows: never password hashes or token versions into a report.
  const users = enrollments.length
    ? await ds.getRepository(UserEntity).find({
        where: { id: In(enrollments.map((e) => e.userId)) },
        select: { id: true, name: true, email: true },
      })
    : []
  const ids = assignmentRows.map((a) => a.id)
  const tallies = await attemptTallies(ds, ids)
  const facts = await apprenticeFacts(ds, assignmentRows)
  const rules = await passRulesOf(
    ds,
    assignmentRows.map((a) => a.scenarioId),
  )
  const overrides = await overrideReasons(ds, ids)
  const nowMs = Date.parse(now)
  let validUntil = Infinity

  const assignments: GradebookAssignment[] = assignmentRows.map((a) => {
    const terms = assignmentTerms(a)
    const rule = rules.get(a.scenarioId) ?? UNKNOWN_RULE
    return {
      id: a.id,
      title: a.title,
      opensAt: a.opensAt,
      dueAt: a.dueAt,
      passMark: rule.passMark,
      requiredObjectives: rule.requiredObjectives,
      latePolicy: terms.latePolicy,
      latePenalty: terms.latePenalty,
      targeted: a.audience === 'selected',
    }
  })

  const rows: GradebookRow[] = users.map((user) => {
    const standings = assignmentRows.map((assignment, index) => {
      const key = pairKey(assignment.id, user.id)
      const terms = personalTerms(assignmentTerms(assignment), facts.facts(assignment, user.id))
      if (terms.dueAt) {
        const due = Date.parse(terms.dueAt)
        if (due > nowMs && due < validUntil) validUntil = due
      }
      const standing = standingOf(terms, tallies.get(key) ?? NO_TALLY, now)
      const passMark = assignments[index]!.passMark
      const overrideReason = overrides.get(key) ?? null
      const cell: GradebookCell = {
        status: standing.status,
        bestScore: standing.bestScore,
        attempts: standing.attempts,
        lastActivity: standing.lastActivity,
        dueAt: terms.dueAt,
        extended: terms.extended,
        requiredMissed:
          !standing.passed &&
          overrideReason === null &&
          passMark !== null &&
          standing.bestRaw !== null &&
          standing.bestRaw >= passMark,
        overrideReason,
      }
      return { standing, cell }
    })
    const summary = summarise(
      standings.map(({ standing: s }) => ({ status: s.status, score: s.bestScore, counts: s.counts })),
    )
    const lastActivity = standings.reduce<string | null>(
      (latest, { cell }) =>
        cell.lastActivity && (!latest || cell.lastActivity > latest) ? cell.lastActivity : latest,
      null,
    )
    return {
      userId: user.id,
      name: user.name,
      email: shownEmail(user.email),
      average: summary.average,
      completion: { passed: summary.passed, assigned: summary.assigned },
      lastActivity,
      cells: standings.map((s) => s.cell),
    }
  })
  return { assignments, rows, validUntil }
}

// One collator for every comparison: the same order as String.prototype.localeCompare, without building
// the locale data on each call.
const collator = new Intl.Collator()

type SortKey = (row: GradebookRow) => string | number | null

function sortKeyOf(gradebook: CohortGradebook, sort: string): SortKey {
  if (sort === 'average') return (row) => row.average
  if (sort === 'lastActivity') return (row) => row.lastActivity
  if (sort === 'email') return (row) => row.email
  if (sort === 'completion')
    return (row) => (row.completion.assigned ? row.completion.passed / row.completion.assigned : null)
  const column = gradebook.assignments.findIndex((a) => a.id === sort)
  if (column >= 0) return (row) => row.cells[column]?.bestScore ?? null
  return (row) => row.name
}

/** The rows that pass the filter, sorted; the gradebook is not changed. */
export function viewGradebook(gradebook: CohortGradebook, filter: GradebookFilter): GradebookRow[] {
  let view = [...gradebook.rows]
  if (filter.q) {
    const needle = filter.q.toLowerCase()
    view = view.filter((r) => r.name.toLowerCase().includes(needle) || r.email.includes(needle))
  }
  if (filter.status) {
    // One assignment's column, or any column; an assignment not in this cohort matches no row.
    const column = filter.assignmentId
      ? gradebook.assignments.findIndex((a) => a.id === filter.assignmentId)
      : undefined
    view = view.filter((r) =>
      column === undefined
        ? r.cells.some((c) => c.status === filter.status)
        : r.cells[column]?.status === filter.status,
    )
  }
  const direction = filter.order === 'desc' ? -1 : 1
  const key = sortKeyOf(gradebook, filter.sort)
  view.sort((a, b) => {
    const ka = key(a)
    const kb = key(b)
    // Empty values sort last whichever the direction, then by name so pages are stable.
    if (ka === null || kb === null) return ka === kb ? collator.compare(a.name, b.name) : ka === null ? 1 : -1
    const order = typeof ka === 'number' ? ka - (kb as number) : collator.compare(String(ka), String(kb))
    return order * direction || collator.compare(a.name, b.name) || collator.compare(a.userId, b.userId)
  })
  return view
}

/** One page as JSON bytes with its entity tag, for the cohort's instructors or an admin. */
export async function gradebookPage(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  query: GradebookPageQuery,
): Promise<GradebookPageBody> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  return ctx.gradebooks.page(cohort, query)
}

/** The gradebook as a CSV file: every apprentice, or the filtered view (named in the file name). */
export async function gradebookCsvFile(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  filter: GradebookFilter,
): Promise<{ fileName: string; csv: string }> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const view = await ctx.gradebooks.view(cohort, filter)
  const timeZone = await centreTimeZone(ctx.dataSource)
  return {
    fileName: gradebookFileName(cohort.name, nowIso(), timeZone, describeFilter(view.assignments, filter)),
    csv: gradebookCsv(view, timeZone),
  }
}

/** The filter in words for the file name; empty when every apprentice is in the file. */
export function describeFilter(
  assignments: GradebookAssignment[],
  filter: Pick<GradebookFilter, 'q' | 'status' | 'assignmentId'>,
): string[] {
  const words: string[] = []
  if (filter.status) {
    words.push(WORK_STATUS_LABELS[filter.status])
    const assignment = assignments.find((a) => a.id === filter.assignmentId)
    if (assignment) words.push('in', assignment.title)
  }
  if (filter.q) words.push('matching', filter.q)
  return words
}
