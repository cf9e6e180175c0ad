// The class view's rows: kept by attempt, updated from the class stream, and sorted by what the instructor
// chooses. Pure, so the tests read it like a table.
import type { LiveClassStreamEvent, LiveRow } from '@shared/api/live'

export const SORT_KEYS = ['apprentice', 'scenario', 'elapsed', 'state', 'safety', 'objectives'] as const
export type SortKey = (typeof SORT_KEYS)[number]

export const SORT_LABELS: Record<SortKey, string> = {
  apprentice: 'Apprentice',
  scenario: 'Exercise',
  elapsed: 'Time open',
  state: 'Connection',
  safety: 'Safety violations',
  objectives: 'Objectives met',
}

/** Rows that need a look first when sorting by connection: disconnected, then idle, working, ended. */
const CONNECTION_ORDER = { disconnected: 0, idle: 1, active: 2, ended: 3 } as const

export function applyClassEvent(rows: readonly LiveRow[], event: LiveClassStreamEvent): LiveRow[] {
  if (event.type === 'gone') return rows.filter((r) => r.attemptId !== event.attemptId)
  const at = rows.findIndex((r) => r.attemptId === event.row.attemptId)
  if (at < 0) return [...rows, event.row]
  const next = [...rows]
  next[at] = event.row
  return next
}

function compare(key: SortKey, a: LiveRow, b: LiveRow): number {
  switch (key) {
    case 'apprentice':
      return a.apprentice.name.localeCompare(b.apprentice.name)
    case 'scenario':
      return a.scenario.title.localeCompare(b.scenario.title)
    case 'elapsed':
      // Open longest first.
      return Date.parse(a.openedAt) - Date.parse(b.openedAt)
    case 'state':
      return CONNECTION_ORDER[a.connection] - CONNECTION_ORDER[b.connection]
    case 'safety':
      return (b.status?.safetyViolations ?? 0) - (a.status?.safetyViolations ?? 0)
    case 'objectives':
      return (b.status?.objectivesMet ?? 0) - (a.status?.objectivesMet ?? 0)
  }
}

/** Sorted by `key` (its natural order; `descending` reverses it), then by name, so the order is stable. */
export function sortRows(rows: readonly LiveRow[], key: SortKey, descending = false): LiveRow[] {
  const sign = descending ? -1 : 1
  return [...rows].sort(
    (a, b) => sign * compare(key, a, b) || a.apprentice.name.localeCompare(b.apprentice.name),
  )
}
