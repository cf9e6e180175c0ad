// What an apprentice's assignment card says about where they stand and what they can do next.
import type { Assignment } from '@shared/api'

export type AssignmentStanding =
  'upcoming' | 'notStarted' | 'inProgress' | 'passed' | 'notPassed' | 'noAttemptsLeft' | 'closed'

export interface StandingView {
  standing: AssignmentStanding
  label: string
  color: 'success' | 'error' | 'warning' | 'info' | 'primary' | undefined
  canStart: boolean
}

export function standingOf(a: Assignment, now: Date = new Date()): StandingView {
  const p = a.myProgress
  const opens = Date.parse(a.opensAt)
  const due = Date.parse(a.dueAt)
  const used = p?.attemptsUsed ?? 0
  const left = a.attemptLimit === null ? Infinity : a.attemptLimit - used
  if (now.getTime() < opens)
    return { standing: 'upcoming', label: 'Opens later', color: 'info', canStart: false }
  if (p?.inProgressAttemptId)
    return { standing: 'inProgress', label: 'In progress', color: 'warning', canStart: true }
  if (p?.passed) return { standing: 'passed', label: 'Passed', color: 'success', canStart: left > 0 }
  if (left <= 0)
    return { standing: 'noAttemptsLeft', label: 'No attempts left', color: 'error', canStart: false }
  const late = now.getTime() > due
  if (used > 0)
    return {
      standing: 'notPassed',
      label: late ? 'Not passed · overdue' : 'Not passed yet',
      color: 'error',
      canStart: true,
    }
  if (late) return { standing: 'closed', label: 'Overdue', color: 'error', canStart: true }
  return { standing: 'notStarted', label: 'Not started', color: undefined, canStart: true }
}

export function attemptsText(a: Assignment): string {
  const used = a.myProgress?.attemptsUsed ?? 0
  return a.attemptLimit === null
    ? `${used} attempt${used === 1 ? '' : 's'} (no limit)`
    : `${used} of ${a.attemptLimit} attempts`
}
