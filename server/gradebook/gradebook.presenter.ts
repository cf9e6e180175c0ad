// A cohort's gradebook view → one page of the API's Gradebook, or the whole view as a CSV sheet in the
// screen's words, dates on the centre's clock.
import type { Gradebook, GradebookAssignment, GradebookCell } from '@shared/api/gradebook'
import { WORK_STATUS_LABELS, latePolicyText, yesNo } from '@shared/progress'
import { formatInZone, zonedDate } from '@shared/time/zone'
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
    assignments,
    rows: rows.slice(start, start + pageSize),
    total: rows.length,
    page,
    pageSize,
  }
}

const score = (value: number | null) => (value === null ? '' : value.toFixed(1))

/** The columns each assignment gets; the first carries the due date, the pass mark and the late rule. */
function assignmentHeaders(a: GradebookAssignment, timeZone: string): string[] {
  const rules = [
    `due ${formatInZone(a.dueAt, timeZone, 'dateTimeZone')}`,
    a.passMark === null ? null : `pass mark ${a.passMark}`,
    a.requiredObjectives ? `${a.requiredObjectives} required objective(s)` : null,
    latePolicyText(a.latePolicy, a.latePenalty).toLowerCase(),
  ].filter(Boolean)
  return [
    `${a.title}: status (${rules.join('; ')})`,
    `${a.title}: score`,
    `${a.title}: attempts`,
    `${a.title}: own due date`,
    `${a.title}: late`,
    `${a.title}: grade changed by instructor`,
    `${a.title}: reason for the change`,
  ]
}

function cellValues(c: GradebookCell, a: GradebookAssignment, timeZone: string): unknown[] {
  const ownDue =
    c.dueAt === a.dueAt
      ? ''
      : c.dueAt === null
        ? 'none (joined after it was due)'
        : formatInZone(c.dueAt, timeZone, 'dateTimeZone')
  return [
    WORK_STATUS_LABELS[c.status] + (c.requiredMissed ? ' (a required objective was missed)' : ''),
    score(c.bestScore),
    c.attempts,
    ownDue,
    yesNo(c.status === 'late'),
    yesNo(c.overrideReason !== null),
    c.overrideReason ?? '',
  ]
}

/** Every row of the view, seven columns per assignment; with a BOM so spreadsheets read it as UTF-8. */
export function gradebookCsv({ assignments, rows }: GradebookView, timeZone: string): string {
  const header = [
    'Name',
    'E-mail',
    'Passed',
    'Set',
    'Average (graded or past due; missed work counts 0; excused left out)',
    `Last activity (${timeZone})`,
    ...assignments.flatMap((a) => assignmentHeaders(a, timeZone)),
  ]
  const body = rows.map((row) => [
    row.name,
    row.email,
    row.completion.passed,
    row.completion.assigned,
    score(row.average),
    formatInZone(row.lastActivity, timeZone, 'dateTime').replace('—', ''),
    ...row.cells.flatMap((c, i) => cellValues(c, assignments[i]!, timeZone)),
  ])
  return '\uFEFF' + toCsv(header, body)
}

const fileSafe = (text: string, max = 60) =>
  text
    .replace(/[^A-Za-z0-9-]+/g, '-')
    .replace(/^-|-$/g, '')
    .slice(0, max)

/**
 * `gradebook-<cohort>-<date>.csv` for every apprentice; a filtered export names its filter:
 * `gradebook-<cohort>-missed-matching-ravi-<date>.csv`. The date is the centre's.
 */
export function gradebookFileName(
  cohortName: string,
  nowIso: string,
  timeZone: string,
  filterWords: string[] = [],
): string {
  const parts = [fileSafe(cohortName) || 'cohort', fileSafe(filterWords.join(' ').toLowerCase(), 80)]
  return `gradebook-${parts.filter(Boolean).join('-')}-${zonedDate(nowIso, timeZone)}.csv`
}
