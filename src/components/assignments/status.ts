// What an apprentice's assignment card says about where they stand and what they can do next, by the
// shared rules (shared/progress) under their own terms: extension, extra attempts, enrolment date.
import type { Assignment } from '@shared/api'
import { checkSubmission, latePolicyText, type PersonalTerms } from '@shared/progress'

export type AssignmentStanding =
  | 'upcoming'
  | 'notStarted'
  | 'inProgress'
  | 'passed'
  | 'passedLate'
  | 'notPassed'
  | 'noAttemptsLeft'
  | 'overdue'
  | 'closed'
  | 'excused'

export interface StandingView {
  standing: AssignmentStanding
  label: string
  color: 'success' | 'error' | 'warning' | 'info' | 'primary' | undefined
  canStart: boolean
}

/** The apprentice's own terms, from the assignment and their progress on it. */
export function termsOf(a: Assignment): PersonalTerms {
  const p = a.myProgress
  return {
    opensAt: a.opensAt,
    dueAt: p ? p.dueAt : a.dueAt,
    attemptLimit: p ? p.attemptLimit : a.attemptLimit,
    latePolicy: a.latePolicy,
    latePenalty: a.latePenalty,
    assigned: true,
    excused: p?.excused ?? false,
    extended: p?.extended ?? false,
  }
}

export function standingOf(a: Assignment, now: Date = new Date()): StandingView {
  const p = a.myProgress
  const used = p?.attemptsUsed ?? 0
  const check = checkSubmission(termsOf(a), now.toISOString(), used)
  const canStart = check.ok
  if (!check.ok && check.refusal === 'notOpen')
    return { standing: 'upcoming', label: 'Opens later', color: 'info', canStart }
  if (p?.excused) return { standing: 'excused', label: 'Excused', color: undefined, canStart }
  if (p?.inProgressAttemptId && canStart)
    return { standing: 'inProgress', label: 'In progress', color: 'warning', canStart }
  if (p?.status === 'passed') return { standing: 'passed', label: 'Passed', color: 'success', canStart }
  if (p?.status === 'late')
    return { standing: 'passedLate', label: 'Passed late', color: 'success', canStart }
  if (!check.ok && check.refusal === 'noAttemptsLeft')
    return { standing: 'noAttemptsLeft', label: 'No attempts left', color: 'error', canStart }
  if (!check.ok && check.refusal === 'closed')
    return { standing: 'closed', label: 'Missed · closed', color: 'error', canStart }
  if (check.ok && check.late)
    return {
      standing: 'overdue',
      label: used > 0 ? 'Not passed · overdue' : 'Overdue',
      color: 'error',
      canStart,
    }
  if (used > 0) return { standing: 'notPassed', label: 'Not passed yet', color: 'error', canStart }
  return { standing: 'notStarted', label: 'Not started', color: undefined, canStart }
}

export function attemptsText(a: Assignment): string {
  const used = a.myProgress?.attemptsUsed ?? 0
  const limit = termsOf(a).attemptLimit
  return limit === null
    ? `${used} attempt${used === 1 ? '' : 's'} (no limit)`
    : `${used} of ${limit} attempts`
}

/** "Due …", or why there is no due date for them; the late rule after it. */
export function dueText(a: Assignment, format: (iso: string) => string): string {
  const terms = termsOf(a)
  if (terms.dueAt === null) return 'No due date for you: you joined after it was due'
  const own = terms.extended ? ' (your own date)' : ''
  return `Due ${format(terms.dueAt)}${own} · ${latePolicyText(a.latePolicy, a.latePenalty).toLowerCase()}`
}
