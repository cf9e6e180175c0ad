// The lateness rules and averages every screen, file and mail uses (shared/progress).
import { describe, expect, it } from 'vitest'
import {
  NO_ATTEMPTS,
  checkSubmission,
  passRule,
  personalTerms,
  summarise,
  workStanding,
  type AssignmentTerms,
  type AttemptTally,
} from '@shared/progress'

const DUE = '2027-03-10T17:00:00.000Z'
const BEFORE_DUE = '2027-03-09T12:00:00.000Z'
const AFTER_DUE = '2027-03-11T09:00:00.000Z'
const assignment: AssignmentTerms = {
  opensAt: '2027-03-01T08:00:00.000Z',
  dueAt: DUE,
  attemptLimit: 3,
  latePolicy: 'acceptLate',
  latePenalty: 10,
}
const enrolledEarly = { enrolledAt: '2027-02-01T00:00:00.000Z', assigned: true, exception: null }
const tally = (fields: Partial<AttemptTally>): AttemptTally => ({ ...NO_ATTEMPTS, ...fields })

describe('an apprentice’s own terms', () => {
  it('has no due date for work due before they enrolled, so it is never overdue or missed for them', () => {
    const terms = personalTerms(assignment, { ...enrolledEarly, enrolledAt: '2027-03-12T10:00:00.000Z' })
    expect(terms.dueAt).toBeNull()
    expect(workStanding(terms, NO_ATTEMPTS, '2027-03-12T11:00:00.000Z')).toEqual({
      status: 'notStarted',
      score: null,
      counts: false,
    })
    const check = checkSubmission(terms, '2027-03-12T11:00:00.000Z', 0)
    expect(check).toEqual({ ok: true, late: false })
  })

  it('keeps the due date for someone who enrolled before it', () => {
    const terms = personalTerms(assignment, enrolledEarly)
    expect(terms.dueAt).toBe(DUE)
    expect(workStanding(terms, NO_ATTEMPTS, AFTER_DUE).status).toBe('missed')
  })

  it('moves the due date and adds attempts with an extension', () => {
    const terms = personalTerms(assignment, {
      ...enrolledEarly,
      exception: { dueAt: '2027-03-14T17:00:00.000Z', extraAttempts: 2, excused: false },
    })
    expect(terms).toMatchObject({ dueAt: '2027-03-14T17:00:00.000Z', attemptLimit: 5, extended: true })
    // The day after the class's due date is neither late nor missed for them…
    expect(workStanding(terms, NO_ATTEMPTS, AFTER_DUE).status).toBe('notStarted')
    expect(checkSubmission(terms, AFTER_DUE, 3)).toEqual({ ok: true, late: false })
    // …but after their own due date it is.
    expect(workStanding(terms, NO_ATTEMPTS, '2027-03-15T09:00:00.000Z').status).toBe('missed')
    expect(checkSubmission(terms, AFTER_DUE, 5)).toMatchObject({ ok: false, refusal: 'noAttemptsLeft' })
  })

  it('gives a late joiner a due date when an extension names one', () => {
    const terms = personalTerms(assignment, {
      enrolledAt: '2027-03-12T10:00:00.000Z',
      assigned: true,
      exception: { dueAt: '2027-03-20T17:00:00.000Z', extraAttempts: 0, excused: false },
    })
    expect(terms.dueAt).toBe('2027-03-20T17:00:00.000Z')
  })

  it('leaves excused work out of the average and the count of work set', () => {
    const terms = personalTerms(assignment, {
      ...enrolledEarly,
      exception: { dueAt: null, extraAttempts: 0, excused: true },
    })
    const excused = workStanding(terms, NO_ATTEMPTS, AFTER_DUE)
    expect(excused).toEqual({ status: 'excused', score: null, counts: false })
    const other = workStanding(
      personalTerms(assignment, enrolledEarly),
      tally({ submitted: 1, bestOnTime: 80, passedOnTime: true }),
      AFTER_DUE,
    )
    expect(summarise([excused, other])).toEqual({ average: 80, passed: 1, assigned: 1 })
  })

  it('leaves work set for other apprentices out entirely', () => {
    const terms = personalTerms(assignment, { ...enrolledEarly, assigned: false })
    expect(workStanding(terms, NO_ATTEMPTS, AFTER_DUE)).toMatchObject({
      status: 'notAssigned',
      counts: false,
    })
    expect(checkSubmission(terms, BEFORE_DUE, 0)).toMatchObject({ ok: false, refusal: 'notAssigned' })
  })
})

describe('late work', () => {
  const terms = personalTerms(assignment, enrolledEarly)

  it('marks a pass submitted after the due date as late and takes the penalty off its score', () => {
    const standing = workStanding(terms, tally({ submitted: 1, bestLate: 92, passedLate: true }), AFTER_DUE)
    expect(standing).toEqual({ status: 'late', score: 82, counts: true })
  })

  it('counts the better of an on-time attempt and a penalised late one', () => {
    const onTimeBetter = tally({
      submitted: 2,
      bestOnTime: 85,
      bestLate: 90,
      passedOnTime: true,
      passedLate: true,
    })
    expect(workStanding(terms, onTimeBetter, AFTER_DUE)).toEqual({
      status: 'passed',
      score: 85,
      counts: true,
    })
    const lateBetter = tally({ submitted: 2, bestOnTime: 50, bestLate: 100, passedLate: true })
    expect(workStanding(terms, lateBetter, AFTER_DUE)).toEqual({ status: 'late', score: 90, counts: true })
  })

  it('never takes a score below zero', () => {
    const harsh = personalTerms({ ...assignment, latePenalty: 50 }, enrolledEarly)
    expect(workStanding(harsh, tally({ submitted: 1, bestLate: 30 }), AFTER_DUE).score).toBe(0)
  })

  it('refuses work after the due date when the assignment closes at it, and accepts it late otherwise', () => {
    expect(checkSubmission(terms, AFTER_DUE, 0)).toEqual({ ok: true, late: true })
    const closing = personalTerms({ ...assignment, latePolicy: 'closeAtDue' }, enrolledEarly)
    expect(checkSubmission(closing, AFTER_DUE, 0)).toMatchObject({ ok: false, refusal: 'closed' })
    expect(checkSubmission(closing, BEFORE_DUE, 0)).toEqual({ ok: true, late: false })
  })

  it('refuses work before the assignment opens', () => {
    expect(checkSubmission(terms, '2027-02-28T08:00:00.000Z', 0)).toMatchObject({
      ok: false,
      refusal: 'notOpen',
    })
  })

  it('calls work missed once the due date passes with nothing passing, keeping a failed score', () => {
    expect(workStanding(terms, tally({ submitted: 1, bestOnTime: 64 }), BEFORE_DUE).status).toBe('failed')
    expect(workStanding(terms, tally({ submitted: 1, bestOnTime: 64 }), AFTER_DUE)).toEqual({
      status: 'missed',
      score: 64,
      counts: true,
    })
    expect(workStanding(terms, tally({ inProgress: true }), AFTER_DUE)).toEqual({
      status: 'missed',
      score: 0,
      counts: true,
    })
  })
})

describe('averages and completion', () => {
  const terms = personalTerms(assignment, enrolledEarly)
  const future = personalTerms({ ...assignment, dueAt: '2027-04-30T17:00:00.000Z' }, enrolledEarly)

  it('averages over everything due or graded, missed work counting 0 (not only what was tried)', () => {
    // 1 of 4 tried: 100 on the first; two missed; one not due yet and not started.
    const standings = [
      workStanding(terms, tally({ submitted: 1, bestOnTime: 100, passedOnTime: true }), AFTER_DUE),
      workStanding(terms, NO_ATTEMPTS, AFTER_DUE),
      workStanding(terms, NO_ATTEMPTS, AFTER_DUE),
      workStanding(future, NO_ATTEMPTS, AFTER_DUE),
    ]
    expect(standings.map((s) => s.status)).toEqual(['passed', 'missed', 'missed', 'notStarted'])
    const summary = summarise(standings)
    expect(summary.average).toBeCloseTo(100 / 3, 10)
    expect(summary).toMatchObject({ passed: 1, assigned: 4 })
  })

  it('counts graded work not yet due at its score', () => {
    const standings = [workStanding(future, tally({ submitted: 1, bestOnTime: 70 }), AFTER_DUE)]
    expect(summarise(standings)).toEqual({ average: 70, passed: 0, assigned: 1 })
  })

  it('has no average before anything counts', () => {
    expect(summarise([workStanding(future, NO_ATTEMPTS, AFTER_DUE)]).average).toBeNull()
  })
})

describe('pass rule', () => {
  it('turns the pass mark from points into a score out of 100 and counts required objectives', () => {
    const rule = passRule({
      passMark: 7,
      objectives: [{ weight: 4, required: true }, { weight: 4 }, { weight: 2, required: true }],
    })
    expect(rule).toEqual({ passMark: 70, requiredObjectives: 2 })
  })
})
