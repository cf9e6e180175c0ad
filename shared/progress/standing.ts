// Where one apprentice stands on one assignment, and what that does to their average: the one
// definition of lateness that the server (gradebook, submission rules, reminders, CSV) and the client
// (an apprentice's own cards) both use. Pure: every function takes "now" and the facts it needs.
//
// Rules:
// - An apprentice's own terms: the assignment's window, unless an exception for them moves the due
//   date or adds attempts, or excuses them. Work due before they enrolled has no due date for them
//   (it can never be late or missed) unless an exception gives them one.
// - Late: submitted after their due date. An assignment either closes at its due date (nothing is
//   accepted after it) or accepts late work with a penalty: points off the late attempt's score.
// - Missed: their due date has passed and nothing passing was submitted.
// - Average: over every assignment that is graded or past due; missed work with no graded attempt
//   counts 0; excused work and work not set for them are left out. Completion: passed (on time or
//   late) out of everything set for them.

export const LATE_POLICIES = ['closeAtDue', 'acceptLate'] as const
export type LatePolicy = (typeof LATE_POLICIES)[number]

export const WORK_STATUSES = [
  'notStarted',
  'inProgress',
  'failed',
  'passed',
  'late',
  'missed',
  'excused',
  'notAssigned',
] as const
export type WorkStatus = (typeof WORK_STATUSES)[number]

export interface AssignmentTerms {
  opensAt: string
  dueAt: string
  attemptLimit: number | null
  latePolicy: LatePolicy
  /** Points (0–100) taken off the score of an attempt submitted late. */
  latePenalty: number
}

/** An instructor's exception for one apprentice on one assignment. */
export interface ApprenticeException {
  /** Their own due date, or null to keep the assignment's. */
  dueAt: string | null
  extraAttempts: number
  excused: boolean
}

export interface ApprenticeFacts {
  enrolledAt: string
  /** False when the assignment is set for selected apprentices and not for this one. */
  assigned: boolean
  exception: ApprenticeException | null
}

export interface PersonalTerms extends Omit<AssignmentTerms, 'dueAt'> {
  /** Their due date; null when it passed before they enrolled (nothing is late or missed for them). */
  dueAt: string | null
  assigned: boolean
  excused: boolean
  /** Their due date differs from the assignment's because of an exception. */
  extended: boolean
}

const ms = (iso: string) => Date.parse(iso)

export function personalTerms(assignment: AssignmentTerms, who: ApprenticeFacts): PersonalTerms {
  const exception = who.exception
  const extendedTo = exception?.dueAt ?? null
  const dueAt = extendedTo ?? (ms(who.enrolledAt) > ms(assignment.dueAt) ? null : assignment.dueAt)
  return {
    ...assignment,
    dueAt,
    attemptLimit:
      assignment.attemptLimit === null ? null : assignment.attemptLimit + (exception?.extraAttempts ?? 0),
    assigned: who.assigned,
    excused: Boolean(exception?.excused),
    extended: extendedTo !== null && extendedTo !== assignment.dueAt,
  }
}

/** Whether work submitted at `at` is late for them. */
export function isLate(terms: Pick<PersonalTerms, 'dueAt'>, at: string): boolean {
  return terms.dueAt !== null && ms(at) > ms(terms.dueAt)
}

export type SubmissionRefusal = 'notAssigned' | 'notOpen' | 'closed' | 'noAttemptsLeft'

export type SubmissionCheck =
  { ok: true; late: boolean } | { ok: false; refusal: SubmissionRefusal; message: string }

/** May they submit (or save) an attempt now, having used `usedAttempts` submitted attempts? */
export function checkSubmission(terms: PersonalTerms, now: string, usedAttempts: number): SubmissionCheck {
  if (!terms.assigned)
    return { ok: false, refusal: 'notAssigned', message: 'This assignment is not set for you' }
  if (ms(now) < ms(terms.opensAt))
    return { ok: false, refusal: 'notOpen', message: 'This assignment is not open yet' }
  const late = isLate(terms, now)
  if (late && terms.latePolicy === 'closeAtDue')
    return { ok: false, refusal: 'closed', message: 'This assignment closed at its due date' }
  if (terms.attemptLimit !== null && usedAttempts >= terms.attemptLimit) {
    return {
      ok: false,
      refusal: 'noAttemptsLeft',
      message: `All ${terms.attemptLimit} attempt(s) allowed have been used`,
    }
  }
  return { ok: true, late }
}

/** The score that counts for one attempt: a late one loses the assignment's penalty. */
export function countedScore(terms: Pick<AssignmentTerms, 'latePenalty'>, score: number, late: boolean) {
  return late ? Math.max(0, score - terms.latePenalty) : score
}

/** One apprentice's attempts on one assignment, summed up (the database does it per pair). */
export interface AttemptTally {
  /** Submitted, graded attempts. */
  submitted: number
  /** Best score of an attempt submitted by their due date. */
  bestOnTime: number | null
  /** Best score (before the penalty) of an attempt submitted after it. */
  bestLate: number | null
  passedOnTime: boolean
  passedLate: boolean
  inProgress: boolean
}

export const NO_ATTEMPTS: AttemptTally = {
  submitted: 0,
  bestOnTime: null,
  bestLate: null,
  passedOnTime: false,
  passedLate: false,
  inProgress: false,
}

export interface WorkStanding {
  status: WorkStatus
  /** The score that counts (late penalty applied); 0 for missed work never graded; null when none. */
  score: number | null
  /** Whether it is part of their average. */
  counts: boolean
}

export function workStanding(terms: PersonalTerms, tally: AttemptTally, now: string): WorkStanding {
  const late = tally.bestLate === null ? null : countedScore(terms, tally.bestLate, true)
  const best =
    tally.bestOnTime === null ? late : late === null ? tally.bestOnTime : Math.max(tally.bestOnTime, late)
  if (!terms.assigned) return { status: 'notAssigned', score: best, counts: false }
  if (terms.excused) return { status: 'excused', score: best, counts: false }
  if (tally.passedOnTime) return { status: 'passed', score: best, counts: true }
  if (tally.passedLate) return { status: 'late', score: best, counts: true }
  if (isLate(terms, now)) return { status: 'missed', score: best ?? 0, counts: true }
  if (tally.submitted > 0) return { status: 'failed', score: best, counts: true }
  return { status: tally.inProgress ? 'inProgress' : 'notStarted', score: null, counts: false }
}

export interface ProgressSummary {
  /** Mean of the scores that count; null when nothing counts yet. */
  average: number | null
  /** Passed, on time or late. */
  passed: number
  /** Set for them and not excused. */
  assigned: number
}

export function summarise(standings: readonly WorkStanding[]): ProgressSummary {
  let total = 0
  let counted = 0
  let passed = 0
  let assigned = 0
  for (const s of standings) {
    if (s.counts) {
      total += s.score ?? 0
      counted++
    }
    if (s.status === 'passed' || s.status === 'late') passed++
    if (s.status !== 'excused' && s.status !== 'notAssigned') assigned++
  }
  return { average: counted ? total / counted : null, passed, assigned }
}

/** A scenario's pass mark as a score (0–100, the scale grades use), and how many objectives are required. */
export function passRule(scenario: {
  passMark: number
  objectives: readonly { weight: number; required?: boolean }[]
}): { passMark: number; requiredObjectives: number } {
  const possible = scenario.objectives.reduce((sum, o) => sum + o.weight, 0)
  return {
    passMark: possible > 0 ? Math.min(100, Math.round((100 * scenario.passMark) / possible)) : 0,
    requiredObjectives: scenario.objectives.filter((o) => o.required).length,
  }
}
