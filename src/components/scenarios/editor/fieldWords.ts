// Small wording helpers for field messages and hints.
import type { FieldDescription } from './schemaFields'

/** A missing or wrong choice reads "Choose a setting", not "Missing: fill this in". */
export function choiceMessages(messages: string[], what: string): string[] {
  return messages.map((m) =>
    /^(Missing|Fill this in|Choose one of|Not one of|Not a terminal|Invalid|Must be)/.test(m)
      ? `Choose ${what}`
      : m,
  )
}

/** A number field's bounds in words, with its unit: "At least 100 V, at most 690 V". */
export function numberHint(field: Extract<FieldDescription, { type: 'number' }>, unit = ''): string {
  const withUnit = (n: number) => (unit ? `${n} ${unit}` : String(n))
  const parts: string[] = []
  if (field.min !== undefined)
    parts.push(field.minExclusive ? `more than ${withUnit(field.min)}` : `at least ${withUnit(field.min)}`)
  if (field.max !== undefined) parts.push(`at most ${withUnit(field.max)}`)
  if (field.integer) parts.push('a whole number')
  const range = parts.join(', ')
  if (field.optional) return `Optional${range ? `; ${range}` : ''}`
  return range.charAt(0).toUpperCase() + range.slice(1)
}
