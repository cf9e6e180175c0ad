// Maps the data table's options (page, sort) and the filters to the server's gradebook query.
import { GRADEBOOK_SORTS, type GradebookCellStatus, type GradebookQuery } from '@shared/api'
import { WORK_STATUS_LABELS } from '@shared/progress'

type SortKey = (typeof GRADEBOOK_SORTS)[number]
/** Header keys of assignment columns: `a:<assignment id>`; sorting one sorts by its scores. */
export const ASSIGNMENT_KEY_PREFIX = 'a:'

export interface TableOptions {
  page: number
  itemsPerPage: number
  sortBy: { key: string; order?: 'asc' | 'desc' | boolean }[]
}

export interface GradebookFilters {
  q: string
  status: GradebookCellStatus | null
  assignmentId: string | null
}

export function toGradebookQuery(options: TableOptions, filters: GradebookFilters): GradebookQuery {
  const first = options.sortBy[0]
  let sort: string = 'name'
  if (first && (GRADEBOOK_SORTS as readonly string[]).includes(first.key)) sort = first.key as SortKey
  else if (first?.key.startsWith(ASSIGNMENT_KEY_PREFIX)) sort = first.key.slice(ASSIGNMENT_KEY_PREFIX.length)
  const order = first?.order === 'desc' ? 'desc' : 'asc'
  const query: GradebookQuery = {
    page: options.page,
    // The table's "all" is -1; the server pages at most 100 rows.
    pageSize: options.itemsPerPage <= 0 ? 100 : Math.min(options.itemsPerPage, 100),
    sort,
    order,
  }
  const q = filters.q.trim()
  if (q) query.q = q
  if (filters.status) query.status = filters.status
  if (filters.assignmentId) query.assignmentId = filters.assignmentId
  return query
}

export const STATUS_LABELS: Record<GradebookCellStatus, string> = WORK_STATUS_LABELS
