// Who is reminded of a due date, and which reminder is due now. Pure, so the rules are tested without a
// database: the scan (due-reminders.service.ts) gathers the facts and queues what this returns.
import { DUE_REMINDER_HOURS } from '@shared/api/mail-preferences'
import type { PersonalTerms } from '@shared/progress'

const HOUR = 3_600_000

export interface ReminderFacts {
  /** Their own terms (shared/progress personalTerms): extension, excused, enrolment after due. */
  terms: PersonalTerms
  /** Something they submitted has passed (on time or late). */
  passed: boolean
  /** Their account is active and has not turned reminders off. */
  wantsReminders: boolean
}

/**
 * The reminder due now, as hours before their due date (48 or 24 by default), or null for none. Only the
 * latest mark already reached counts: someone given the work 30 hours before it is due gets the 48-hour
 * reminder once, someone given it 10 hours before gets only the 24-hour one.
 */
export function reminderDue(
  facts: ReminderFacts,
  now: number,
  hours: readonly number[] = DUE_REMINDER_HOURS,
): number | null {
  const { terms } = facts
  if (!terms.assigned || terms.excused || facts.passed || !facts.wantsReminders) return null
  if (terms.dueAt === null) return null // due before they enrolled: nothing is owed
  const due = Date.parse(terms.dueAt)
  if (now >= due || now < Date.parse(terms.opensAt)) return null
  const reached = hours.filter((h) => due - h * HOUR <= now)
  return reached.length ? Math.min(...reached) : null
}

/**
 * One reminder per apprentice, assignment, mark and due date, ever: a second scan, a second instance or a
 * restart queues nothing new, while a new due date (an extension) earns its own reminders.
 */
export const reminderKey = (assignmentId: string, userId: string, hours: number, dueAt: string) =>
  `reminder:${assignmentId}:${userId}:${hours}h:${dueAt}`
