// Maps the data table's options (page, sort) and the filters to the server's gradebook query.
import type { GradebookCellStatus, GradebookQuery } from '@shared/api'

export const SORTABLE = ['name', 'email', 'lastActivity', 'average'] as const
type SortKey = (typeof SORTABLE)[number]

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
  const sort = first && (SORTABLE as readonly string[]).includes(first.key) ? (first.key as SortKey) : 'name'
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

export const STATUS_LABELS: Record<GradebookCellStatus, string> = {
  notStarted: 'Not started',
  inProgress: 'In progress',
  passed: 'Passed',
  failed: 'Not passed',
}
