// The gradebook of a cohort: every apprentice × every assignment (loadGradebook, from the database), then
// filtered and sorted (viewGradebook, pure); gradebook-cache.ts keeps both between requests. Instructors
// read it a page at a time (gradebookPage) or whole as CSV (gradebookCsvFile).
import type { DataSource } from 'typeorm'
import { In } from 'typeorm'
import type { GradebookCellStatus, GradebookRow } from '@shared/api/gradebook'
import {
  AssignmentEntity,
  EnrollmentEntity,
  UserEntity,
  type AssignmentRow,
  type CohortRow,
  type UserRow,
} from '../entities'
import { cohortFor } from '../access/access.service'
import type { AppContext } from '../context'
import { nowIso } from '../infrastructure/clock'
import type { GradebookPageBody, GradebookPageQuery } from './gradebook-cache'
import { gradebookCsv, gradebookFileName } from './gradebook.presenter'
import { NOT_STARTED, standingsByAssignmentAndUser } from './standings'
import { shownEmail } from '@shared/api/users'

export interface GradebookFilter {
  sort: 'name' | 'email' | 'lastActivity' | 'average'
  order: 'asc' | 'desc'
  q?: string
  status?: GradebookCellStatus
  assignmentId?: string
}

export interface CohortGradebook {
  assignments: AssignmentRow[]
  /** One row per enrolled apprentice, in no particular order. */
  rows: GradebookRow[]
}

export async function loadGradebook(ds: DataSource, cohort: CohortRow): Promise<CohortGradebook> {
  const assignments = await ds
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
  const standings = await standingsByAssignmentAndUser(
    ds,
    assignments.map((a) => a.id),
  )
  const rows: GradebookRow[] = users.map((user) => {
    const cells = assignments.map((assignment) => {
      const standing = standings.get(`${assignment.id}:${user.id}`) ?? NOT_STARTED
      return {
        bestScore: standing.bestScore,
        attempts: standing.attempts,
        lastActivity: standing.lastActivity,
        status: standing.status,
      }
    })
    const scored = cells.filter((c) => c.bestScore !== null).map((c) => c.bestScore!)
    const lastActivity = cells.reduce<string | null>(
      (latest, c) => (c.lastActivity && (!latest || c.lastActivity > latest) ? c.lastActivity : latest),
      null,
    )
    return {
      userId: user.id,
      name: user.name,
      email: shownEmail(user.email),
      average: scored.length ? scored.reduce((a, b) => a + b, 0) / scored.length : null,
      lastActivity,
      cells,
    }
  })
  return { assignments, rows }
}

// One collator for every comparison: the same order as String.prototype.localeCompare, without building
// the locale data on each call.
const collator = new Intl.Collator()

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
  const key = (row: GradebookRow): string | number | null =>
    filter.sort === 'average'
      ? row.average
      : filter.sort === 'lastActivity'
        ? row.lastActivity
        : row[filter.sort]
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

/** One page as JSON bytes with its entity tag, for the cohort's instructor or an admin. */
export async function gradebookPage(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  query: GradebookPageQuery,
): Promise<GradebookPageBody> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  return ctx.gradebooks.page(cohort, query)
}

/** The whole filtered, sorted gradebook as a CSV file. */
export async function gradebookCsvFile(
  ctx: AppContext,
  user: UserRow,
  cohortId: string,
  filter: GradebookFilter,
): Promise<{ fileName: string; csv: string }> {
  const cohort = await cohortFor(ctx.dataSource, user, cohortId, 'manage')
  const view = await ctx.gradebooks.view(cohort, filter)
  return { fileName: gradebookFileName(cohort.name, nowIso().slice(0, 10)), csv: gradebookCsv(view) }
}
