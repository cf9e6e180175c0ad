// A cohort's gradebook view → one page of the API's Gradebook, or the whole view as a CSV sheet.
import type { Gradebook } from '@shared/api/gradebook'
import { toCsv } from '../infrastructure/csv'
import type { GradebookView } from './gradebook-cache'

export function presentGradebookPage(
  cohortId: string,
  { assignments, rows }: GradebookView,
  page: number,
  pageSize: number,
): Gradebook {
  const start = (page - 1) * pageSize
  return {
    cohortId,
    assignments: assignments.map((a) => ({ id: a.id, title: a.title, dueAt: a.dueAt })),
    rows: rows.slice(start, start + pageSize),
    total: rows.length,
    page,
    pageSize,
  }
}

/** Every row, three columns per assignment; with a BOM so spreadsheets read it as UTF-8. */
export function gradebookCsv({ assignments, rows }: GradebookView): string {
  const header = [
    'Name',
    'E-mail',
    'Average',
    'Last activity',
    ...assignments.flatMap((a) => [`${a.title} — best`, `${a.title} — attempts`, `${a.title} — status`]),
  ]
  const body = rows.map((row) => [
    row.name,
    row.email,
    row.average === null ? '' : row.average.toFixed(1),
    row.lastActivity ?? '',
    ...row.cells.flatMap((c) => [c.bestScore === null ? '' : c.bestScore.toFixed(1), c.attempts, c.status]),
  ])
  return '\uFEFF' + toCsv(header, body)
}

/** `gradebook-<cohort name, file-safe>-<date>.csv` */
export function gradebookFileName(cohortName: string, date: string): string {
  const safeName =
    cohortName
      .replace(/[^A-Za-z0-9-]+/g, '-')
      .replace(/^-|-$/g, '')
      .slice(0, 60) || 'cohort'
  return `gradebook-${safeName}-${date}.csv`
}
