// Reads a roster CSV (columns name and e-mail, any order) into rows, or a list of per-row errors.
import { parse } from 'csv-parse/sync'
import { emailSchema, personNameSchema } from '@shared/api/common'
import { ROSTER_MAX_ROWS, type RosterRowError } from '@shared/api/invitations'

export interface RosterRow {
  line: number
  name: string
  email: string
}

const EMAIL_HEADERS = ['email', 'e-mail', 'email address', 'e-mail address']

export function readRoster(content: string): { rows: RosterRow[]; errors: RosterRowError[] } {
  let records: string[][]
  try {
    records = parse(content.replace(/^\uFEFF/, ''), {
      skip_empty_lines: true,
      relax_column_count: true,
      trim: true,
    })
  } catch (error) {
    return {
      rows: [],
      errors: [{ row: 1, field: '(file)', message: `Not a readable CSV file: ${(error as Error).message}` }],
    }
  }
  const [header, ...body] = records
  const columns = (header ?? []).map((cell) => cell.toLowerCase())
  const nameAt = columns.indexOf('name')
  const emailAt = columns.findIndex((cell) => EMAIL_HEADERS.includes(cell))
  if (nameAt < 0 || emailAt < 0) {
    return {
      rows: [],
      errors: [{ row: 1, field: '(header)', message: 'The first row must name the columns: name, email' }],
    }
  }
  if (body.length === 0)
    return { rows: [], errors: [{ row: 2, field: '(file)', message: 'The roster has no rows' }] }
  if (body.length > ROSTER_MAX_ROWS) {
    return {
      rows: [],
      errors: [{ row: ROSTER_MAX_ROWS + 2, field: '(file)', message: `At most ${ROSTER_MAX_ROWS} rows` }],
    }
  }
  const rows: RosterRow[] = []
  const errors: RosterRowError[] = []
  const seen = new Map<string, number>()
  body.forEach((record, index) => {
    const line = index + 2
    const name = personNameSchema.safeParse(record[nameAt] ?? '')
    const email = emailSchema.safeParse(record[emailAt] ?? '')
    if (!name.success) errors.push({ row: line, field: 'name', message: name.error.issues[0]!.message })
    if (!email.success) errors.push({ row: line, field: 'email', message: email.error.issues[0]!.message })
    if (name.success && email.success) {
      const earlier = seen.get(email.data)
      if (earlier) errors.push({ row: line, field: 'email', message: `Same address as row ${earlier}` })
      else {
        seen.set(email.data, line)
        rows.push({ line, name: name.data, email: email.data })
      }
    }
  })
  return { rows, errors }
}
