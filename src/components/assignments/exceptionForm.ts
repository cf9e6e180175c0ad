// The exception dialog's values, their check against the shared request schema, and the words that
// describe an apprentice's exception on the assignment page.
import { exceptionRequestSchema, type AssignmentApprentice, type ExceptionRequest } from '@shared/api'
import { fromLocalInput, formatDateTime } from '@/composables/format'
import { issuesByField } from '@/composables/validation'

export interface ExceptionFormValues {
  /** Give them their own due date (off: the assignment's). */
  ownDueDate: boolean
  dueAt: string // datetime-local value
  extraAttempts: number | string
  excused: boolean
  reason: string
}

export type ExceptionFormResult =
  { ok: true; body: ExceptionRequest } | { ok: false; errors: Record<string, string> }

/** The request for the apprentices chosen; every field is sent, so all of them end up with the same terms. */
export function checkExceptionForm(userIds: string[], v: ExceptionFormValues): ExceptionFormResult {
  if (v.ownDueDate && !v.dueAt) return { ok: false, errors: { dueAt: 'Choose their due date' } }
  const candidate = {
    userIds,
    dueAt: v.ownDueDate ? fromLocalInput(v.dueAt) : null,
    extraAttempts: Number(v.extraAttempts),
    excused: v.excused,
    reason: v.reason,
  }
  const parsed = exceptionRequestSchema.safeParse(candidate)
  if (parsed.success) return { ok: true, body: parsed.data }
  const errors = issuesByField(parsed.error)
  if (errors.extraAttempts) errors.extraAttempts = 'A whole number from 0 to 50'
  return { ok: false, errors }
}

/** "Own due date 12 Dec 17:00 · 2 extra attempts · excused", or '' when they have none. */
export function exceptionText(
  a: Pick<AssignmentApprentice, 'extended' | 'dueAt' | 'extraAttempts' | 'excused'>,
) {
  const parts: string[] = []
  if (a.excused) parts.push('Excused')
  if (a.extended && a.dueAt) parts.push(`Own due date ${formatDateTime(a.dueAt)}`)
  if (a.extraAttempts) parts.push(`${a.extraAttempts} extra attempt${a.extraAttempts === 1 ? '' : 's'}`)
  return parts.join(' · ')
}

/** What the confirmation says will happen to the apprentices chosen. */
export function exceptionSummary(body: ExceptionRequest, names: string[], assignmentDue: string): string {
  const who =
    names.length <= 3 ? names.join(', ') : `${names.slice(0, 3).join(', ')} and ${names.length - 3} more`
  const terms = [
    body.dueAt
      ? `due ${formatDateTime(body.dueAt)}`
      : `due with everyone else (${formatDateTime(assignmentDue)})`,
    `${body.extraAttempts ?? 0} extra attempt${body.extraAttempts === 1 ? '' : 's'}`,
    body.excused ? 'excused' : 'not excused',
  ]
  return `${who}: ${terms.join(', ')}. Any exception they already have is replaced. Attempts already made are re-marked late or on time by the new date.`
}
