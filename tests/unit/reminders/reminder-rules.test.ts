// Who gets a due-date reminder, and which one (server/reminders/reminder-rules.ts), on the same personal
// terms the gradebook uses (shared/progress): extension, excused, passed, enrolled after due, opted out.
// The 48 h and 24 h marks are the defaults, not a published figure.
import { describe, expect, it } from 'vitest'
import { personalTerms, type ApprenticeFacts, type AssignmentTerms } from '@shared/progress'
import { reminderDue, reminderKey, type ReminderFacts } from '../../../server/reminders/reminder-rules'

const HOUR = 3_600_000
const DUE = '2027-03-10T17:00:00.000Z'
const due = Date.parse(DUE)
const assignment: AssignmentTerms = {
  opensAt: '2027-03-01T08:00:00.000Z',
  dueAt: DUE,
  attemptLimit: null,
  latePolicy: 'closeAtDue',
  latePenalty: 0,
}
const member: ApprenticeFacts = { enrolledAt: '2027-02-01T00:00:00.000Z', assigned: true, exception: null }
const facts = (who: Partial<ApprenticeFacts> = {}, rest: Partial<ReminderFacts> = {}): ReminderFacts => ({
  terms: personalTerms(assignment, { ...member, ...who }),
  passed: false,
  wantsReminders: true,
  ...rest,
})

describe('which reminder is due', () => {
  it('sends nothing more than 48 hours before the due date', () => {
    expect(reminderDue(facts(), due - 49 * HOUR)).toBeNull()
  })

  it('sends the 48-hour reminder from 48 hours before, and the 24-hour one from 24 hours before', () => {
    expect(reminderDue(facts(), due - 48 * HOUR)).toBe(48)
    expect(reminderDue(facts(), due - 30 * HOUR)).toBe(48)
    expect(reminderDue(facts(), due - 24 * HOUR)).toBe(24)
    expect(reminderDue(facts(), due - 1 * HOUR)).toBe(24)
  })

  it('sends nothing once the due date has passed', () => {
    expect(reminderDue(facts(), due)).toBeNull()
    expect(reminderDue(facts(), due + HOUR)).toBeNull()
  })

  it('follows marks other than the defaults', () => {
    expect(reminderDue(facts(), due - 5 * HOUR, [72, 6])).toBe(6)
    expect(reminderDue(facts(), due - 7 * HOUR, [72, 6])).toBe(72)
  })
})

describe('who is reminded', () => {
  const dayBefore = due - 20 * HOUR

  it('reminds an apprentice who has not passed, tried or not', () => {
    expect(reminderDue(facts(), dayBefore)).toBe(24)
  })

  it('does not remind one who has passed', () => {
    expect(reminderDue(facts({}, { passed: true }), dayBefore)).toBeNull()
  })

  it('does not remind one who is excused', () => {
    const excused = { dueAt: null, extraAttempts: 0, excused: true }
    expect(reminderDue(facts({ exception: excused }), dayBefore)).toBeNull()
  })

  it('does not remind one who turned reminders off (or whose account is inactive)', () => {
    expect(reminderDue(facts({}, { wantsReminders: false }), dayBefore)).toBeNull()
  })

  it('does not remind one the work is not set for', () => {
    expect(reminderDue(facts({ assigned: false }), dayBefore)).toBeNull()
  })

  it('follows an extension: nothing before the cohort’s date, reminders before their own', () => {
    const extension = { dueAt: new Date(due + 5 * 24 * HOUR).toISOString(), extraAttempts: 0, excused: false }
    const extended = facts({ exception: extension })
    expect(reminderDue(extended, dayBefore)).toBeNull()
    expect(reminderDue(extended, due + 5 * 24 * HOUR - 47 * HOUR)).toBe(48)
    expect(reminderDue(extended, due + 5 * 24 * HOUR - 2 * HOUR)).toBe(24)
  })

  it('follows an earlier due date given to one apprentice', () => {
    const earlier = { dueAt: new Date(due - 3 * 24 * HOUR).toISOString(), extraAttempts: 0, excused: false }
    expect(reminderDue(facts({ exception: earlier }), due - 3 * 24 * HOUR - 10 * HOUR)).toBe(24)
  })

  it('does not remind one who enrolled after the due date', () => {
    const late = facts({ enrolledAt: new Date(due + HOUR).toISOString() })
    expect(late.terms.dueAt).toBeNull()
    expect(reminderDue(late, due + 2 * HOUR)).toBeNull()
    expect(reminderDue(late, dayBefore)).toBeNull()
  })

  it('reminds one who enrolled a day before the due date, with the 24-hour reminder only', () => {
    expect(reminderDue(facts({ enrolledAt: new Date(dayBefore - HOUR).toISOString() }), dayBefore)).toBe(24)
  })
})

describe('reminder keys', () => {
  it('differ by mark and by due date, so an extension earns fresh reminders', () => {
    const a = reminderKey('a1', 'u1', 48, DUE)
    expect(a).toBe(`reminder:a1:u1:48h:${DUE}`)
    expect(reminderKey('a1', 'u1', 24, DUE)).not.toBe(a)
    expect(reminderKey('a1', 'u1', 48, '2027-03-15T17:00:00.000Z')).not.toBe(a)
  })
})
