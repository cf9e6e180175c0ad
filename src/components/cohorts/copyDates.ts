// Date arithmetic for copying a cohort: whole days between calendar dates, so times of day stay put.
const DAY_MS = 86_400_000

/** The earliest opening among these assignments (null when there are none). */
export function firstOpening(assignments: readonly { opensAt: string }[]): Date | null {
  if (!assignments.length) return null
  return new Date(Math.min(...assignments.map((a) => Date.parse(a.opensAt))))
}

/** A date as an `<input type="date">` value, on this computer's calendar. */
export function toDateInput(date: Date): string {
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}`
}

/** Whole calendar days from `from`'s date to `to` (YYYY-MM-DD), counted on a calendar without clock changes. */
export function shiftDaysTo(from: Date, to: string): number {
  const [y, m, d] = to.split('-').map(Number)
  if (!y || !m || !d) return 0
  const start = Date.UTC(from.getFullYear(), from.getMonth(), from.getDate())
  return Math.round((Date.UTC(y, m - 1, d) - start) / DAY_MS)
}

/** An ISO instant moved by whole days. */
export function shifted(iso: string, days: number): string {
  return new Date(Date.parse(iso) + days * DAY_MS).toISOString()
}
