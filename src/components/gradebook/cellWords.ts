// What a gradebook cell says, in words: the chip's text, its colour, its marks and the sentence a screen
// reader hears. Pure, so the same words are tested without a browser.
import type { GradebookAssignment, GradebookCell } from '@shared/api'
import { WORK_STATUS_LABELS } from '@shared/progress'
import { formatDateTime, formatScore } from '@/composables/format'

export const STATUS_COLORS: Record<GradebookCell['status'], string | undefined> = {
  notStarted: undefined,
  inProgress: 'info',
  failed: 'error',
  passed: 'success',
  late: 'success',
  missed: 'error',
  excused: undefined,
  notAssigned: undefined,
}

/** Statuses that a score alone would hide; the chip names them next to the score. */
const NAMED_WITH_SCORE = new Set<GradebookCell['status']>(['late', 'missed', 'excused', 'notAssigned'])

export function chipText(cell: GradebookCell): string {
  if (cell.status === 'notAssigned') return 'Not set'
  if (cell.bestScore === null || cell.status === 'excused') return WORK_STATUS_LABELS[cell.status]
  const score = formatScore(cell.bestScore)
  return NAMED_WITH_SCORE.has(cell.status)
    ? `${score} · ${WORK_STATUS_LABELS[cell.status].toLowerCase()}`
    : score
}

export interface CellMark {
  kind: 'changed' | 'ownDue' | 'requiredMissed'
  text: string
}

export function cellMarks(cell: GradebookCell, assignment: GradebookAssignment): CellMark[] {
  const marks: CellMark[] = []
  if (cell.overrideReason !== null)
    marks.push({ kind: 'changed', text: `Grade changed by an instructor: “${cell.overrideReason}”` })
  if (cell.dueAt !== assignment.dueAt)
    marks.push({
      kind: 'ownDue',
      text:
        cell.dueAt === null
          ? 'No due date: joined after it was due'
          : `Own due date: ${formatDateTime(cell.dueAt)}`,
    })
  if (cell.requiredMissed)
    marks.push({
      kind: 'requiredMissed',
      text: 'At or above the pass mark, but a required objective was missed',
    })
  return marks
}

export function cellLabel(name: string, cell: GradebookCell, assignment: GradebookAssignment): string {
  const parts = [
    `${name}, ${assignment.title}: ${WORK_STATUS_LABELS[cell.status]}`,
    cell.bestScore === null ? 'no score' : `score ${formatScore(cell.bestScore)}`,
    `${cell.attempts} attempt${cell.attempts === 1 ? '' : 's'}`,
    ...cellMarks(cell, assignment).map((m) => m.text),
  ]
  return parts.join(', ')
}
