// Reads a roster CSV in the browser for the preview: one row per apprentice, each checked by the
// shared invitation schema, so errors show per row before anything is sent.
import { parse } from 'csv-parse/browser/esm/sync'
import { inviteRequestSchema, ROSTER_MAX_ROWS, rosterRowErrorSchema, type RosterRowError } from '@shared/api'
import { z } from 'zod'

export interface RosterPreviewRow {
  /** 1-based line in the file, header included (the server reports errors the same way). */
  line: number
  name: string
  email: string
  errors: Record<string, string>
}

export interface RosterPreview {
  rows: RosterPreviewRow[]
  fileErrors: string[]
  validCount: number
}

export function previewRoster(text: string): RosterPreview {
  let records: string[][]
  try {
    records = parse(text.replace(/^\uFEFF/, ''), {
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
    })
  } catch (e) {
    return {
      rows: [],
      fileErrors: [`The file is not readable as CSV: ${(e as Error).message}`],
      validCount: 0,
    }
  }
  if (!records.length) return { rows: [], fileErrors: ['The file is empty.'], validCount: 0 }

  const header = records[0].map((h) => h.trim().toLowerCase())
  const nameAt = header.indexOf('name')
  const emailAt = header.findIndex((h) => h === 'email' || h === 'e-mail')
  const fileErrors: string[] = []
  if (nameAt < 0 || emailAt < 0) {
    fileErrors.push('The first row must name the columns, including “name” and “email”.')
    return { rows: [], fileErrors, validCount: 0 }
  }
  if (records.length - 1 > ROSTER_MAX_ROWS)
    fileErrors.push(`At most ${ROSTER_MAX_ROWS} apprentices per file.`)
  if (records.length === 1) fileErrors.push('The file has a header row but no apprentices.')

  const seen = new Map<string, number>()
  const rows = records.slice(1).map((record, i): RosterPreviewRow => {
    const line = i + 2
    const name = record[nameAt] ?? ''
    const email = record[emailAt] ?? ''
    const errors: Record<string, string> = {}
    const parsed = inviteRequestSchema.safeParse({ name, email })
    if (!parsed.success) {
      for (const issue of parsed.error.issues) errors[String(issue.path[0])] ??= issue.message
    } else {
      const first = seen.get(parsed.data.email)
      if (first) errors.email = `Same e-mail as line ${first}`
      else seen.set(parsed.data.email, line)
    }
    return { line, name, email, errors }
  })
  return { rows, fileErrors, validCount: rows.filter((r) => !Object.keys(r.errors).length).length }
}

/** Adds the server's per-row errors (when it refuses the file) to the preview rows. */
export function mergeServerRowErrors(preview: RosterPreview, details: unknown): RosterPreview {
  const parsed = z.object({ rows: z.array(rosterRowErrorSchema) }).safeParse(details)
  const fromArray = z.array(rosterRowErrorSchema).safeParse(details)
  const list: RosterRowError[] = parsed.success ? parsed.data.rows : fromArray.success ? fromArray.data : []
  if (!list.length) return preview
  const rows = preview.rows.map((r) => ({ ...r, errors: { ...r.errors } }))
  for (const err of list) {
    const row = rows.find((r) => r.line === err.row)
    if (row) row.errors[err.field] ??= err.message
  }
  return { ...preview, rows, validCount: rows.filter((r) => !Object.keys(r.errors).length).length }
}

/** The column a problem is in, in the words of the preview's headings (never the field's name). */
const COLUMN_WORDS: Record<string, string> = { name: 'Name', email: 'E-mail' }

/** One problem of a row as the preview shows it: "E-mail: Must be an e-mail address". */
export function rowProblem(field: string, message: string): string {
  const column = COLUMN_WORDS[field]
  return column ? `${column}: ${message}` : message
}
