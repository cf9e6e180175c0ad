// CSV export through csv-stringify, with formula injection neutralised (OWASP "CSV Injection").
import { stringify } from 'csv-stringify/sync'

/** A cell a spreadsheet would run as a formula gets a leading apostrophe, so it is shown as text. */
export function neutraliseCell(value: unknown): string {
  if (value === null || value === undefined) return ''
  const text = String(value)
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text
}

export function toCsv(header: string[], rows: unknown[][]): string {
  return stringify([header.map(neutraliseCell), ...rows.map((row) => row.map(neutraliseCell))], {
    record_delimiter: 'windows', // RFC 4180 line ends, which spreadsheets expect
  })
}
