// The gradebook of a cohort: every apprentice × every assignment, then filtered, sorted and paged.
import type { DataSource } from 'typeorm'
import { In } from 'typeorm'
import type { GradebookCellStatus, GradebookRow } from '@shared/api/gradebook'
import { AssignmentEntity, EnrollmentEntity, UserEntity, type CohortRow } from '../entities'
import { NOT_STARTED, standingsByAssignmentAndUser } from './progress'

export interface GradebookFilter {
  sort: 'name' | 'email' | 'lastActivity' | 'average'
  order: 'asc' | 'desc'
  q?: string
  status?: GradebookCellStatus
  assignmentId?: string
}

export async function buildGradebook(ds: DataSource, cohort: CohortRow, filter: GradebookFilter) {
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
  let rows: GradebookRow[] = users.map((user) => {
    const cells = assignments.map((assignment) => {
      const standing = standings.get(`${assignment.id}:${user.id}`) ?? NOT_STARTED
      return {
        assignmentId: assignment.id,
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
      email: user.email,
      average: scored.length ? scored.reduce((a, b) => a + b, 0) / scored.length : null,
      lastActivity,
      cells,
    }
  })
  if (filter.q) {
    const needle = filter.q.toLowerCase()
    rows = rows.filter((r) => r.name.toLowerCase().includes(needle) || r.email.includes(needle))
  }
  if (filter.status) {
    rows = rows.filter((r) =>
      r.cells.some(
        (c) => c.status === filter.status && (!filter.assignmentId || c.assignmentId === filter.assignmentId),
      ),
    )
  }
  const direction = filter.order === 'desc' ? -1 : 1
  const key = (row: GradebookRow): string | number | null =>
    filter.sort === 'average'
      ? row.average
      : filter.sort === 'lastActivity'
        ? row.lastActivity
        : row[filter.sort]
  rows.sort((a, b) => {
    const ka = key(a)
    const kb = key(b)
    // Empty values sort last whichever the direction, then by name so pages are stable.
    if (ka === null || kb === null) return ka === kb ? a.name.localeCompare(b.name) : ka === null ? 1 : -1
    const order = typeof ka === 'number' ? ka - (kb as number) : String(ka).localeCompare(String(kb))
    return order * direction || a.name.localeCompare(b.name) || a.userId.localeCompare(b.userId)
  })
  return { assignments, rows }
}
