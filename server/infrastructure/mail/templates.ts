// The messages Slipway sends, each as plain text and HTML built from the same words.
import { formatInZone } from '@shared/time/zone'
import type { OutgoingMail } from './mail-job'

const escapeHtml = (value: string) =>
  value.replace(
    /[&<>"']/g,
    (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!,
  )

interface Template {
  to: string
  subject: string
  greeting: string
  paragraphs: string[]
  action?: { label: string; url: string }
}

const SIGN_OFF = 'Slipway — the drive-wiring training bench'

function render({ to, subject, greeting, paragraphs, action }: Template): OutgoingMail {
  const text = [
    greeting,
    '',
    ...paragraphs.flatMap((p) => [p, '']),
    ...(action ? [`${action.label}: ${action.url}`, ''] : []),
    SIGN_OFF,
  ].join('\n')
  const html = [
    `<p>${escapeHtml(greeting)}</p>`,
    // A paragraph's own line breaks (a digest's list) are kept.
    ...paragraphs.map((p) => `<p>${escapeHtml(p).replace(/\n/g, '<br>')}</p>`),
    action ? `<p><a href="${escapeHtml(action.url)}">${escapeHtml(action.label)}</a></p>` : '',
    `<p style="color:#555">${escapeHtml(SIGN_OFF)}</p>`,
  ].join('\n')
  return { to, subject, text, html }
}

export function invitationMail(input: {
  to: string
  name: string
  invitedBy: string
  cohortName: string | null
  role: string
  url: string
  expiresAt: string
  /** The centre's time zone (dates in mail are on its clock). */
  timeZone: string
}): OutgoingMail {
  const where = input.cohortName ? `the cohort “${input.cohortName}”` : `Slipway as an ${input.role}`
  return render({
    to: input.to,
    subject: input.cohortName
      ? `You are invited to ${input.cohortName} on Slipway`
      : 'You are invited to Slipway',
    greeting: `Hello ${input.name},`,
    paragraphs: [
      `${input.invitedBy} has invited you to join ${where}.`,
      `Open the link below to choose your password. The link works once and expires on ${formatInZone(input.expiresAt, input.timeZone, 'dateTimeZone')}.`,
    ],
    action: { label: 'Accept the invitation', url: input.url },
  })
}

export function passwordResetMail(input: {
  to: string
  name: string
  url: string
  minutes: number
}): OutgoingMail {
  return render({
    to: input.to,
    subject: 'Reset your Slipway password',
    greeting: `Hello ${input.name},`,
    paragraphs: [
      `Someone asked to reset the password of this account. The link below works once, within ${input.minutes} minutes.`,
      'If it was not you, ignore this message: your password stays as it is.',
    ],
    action: { label: 'Choose a new password', url: input.url },
  })
}

export function assignmentPublishedMail(input: {
  to: string
  name: string
  title: string
  cohortName: string
  dueAt: string
  timeZone: string
  url: string
}): OutgoingMail {
  return render({
    to: input.to,
    subject: `New assignment: ${input.title}`,
    greeting: `Hello ${input.name},`,
    paragraphs: [
      `A new exercise, “${input.title}”, has been set for ${input.cohortName}. It is due by ${formatInZone(input.dueAt, input.timeZone, 'dateTimeZone')}.`,
      'Before any work on a real drive: isolate, lock out and tag out, wait for the DC bus to discharge and prove absence of voltage.',
    ],
    action: { label: 'Open the assignment', url: input.url },
  })
}

export function attemptReviewedMail(input: {
  to: string
  name: string
  title: string
  what: 'graded' | 'overridden' | 'feedback'
  score?: number
  passed?: boolean
  url: string
}): OutgoingMail {
  const verdict = `${input.score} / 100 (${input.passed ? 'pass' : 'not yet a pass'})`
  const detail = {
    graded: `Your attempt at “${input.title}” has been graded: ${verdict}.`,
    overridden: `Your instructor has changed your grade for “${input.title}”: ${verdict}.`,
    feedback: `Your instructor has left feedback on your attempt at “${input.title}”.`,
  }[input.what]
  const subject = {
    graded: `Graded: ${input.title}`,
    overridden: `Grade updated: ${input.title}`,
    feedback: `Feedback on ${input.title}`,
  }[input.what]
  return render({
    to: input.to,
    subject,
    greeting: `Hello ${input.name},`,
    paragraphs: [detail],
    action: { label: 'See your attempt', url: input.url },
  })
}

export function cohortMessageMail(input: {
  to: string
  name: string
  cohortName: string
  instructorName: string
  subject: string
  body: string
  url: string
}): OutgoingMail {
  return render({
    to: input.to,
    subject: `${input.cohortName}: ${input.subject}`,
    greeting: `Hello ${input.name},`,
    paragraphs: [
      ...input.body
        .split(/\n\s*\n/)
        .map((p) => p.trim())
        .filter(Boolean),
      `— ${input.instructorName}, your instructor for ${input.cohortName}`,
    ],
    action: { label: 'Open Slipway', url: input.url },
  })
}

export function dueReminderMail(input: {
  to: string
  name: string
  title: string
  cohortName: string
  /** Their own due date (an extension included). */
  dueAt: string
  timeZone: string
  /** The reminder's mark: 48 or 24 hours before. */
  hours: number
  /** They have submitted something that has not passed yet. */
  tried: boolean
  url: string
  profileUrl: string
}): OutgoingMail {
  const when = input.hours >= 48 ? 'in two days' : input.hours >= 24 ? 'tomorrow' : 'soon'
  return render({
    to: input.to,
    subject: `Due ${when}: ${input.title}`,
    greeting: `Hello ${input.name},`,
    paragraphs: [
      `“${input.title}” (${input.cohortName}) is due by ${formatInZone(input.dueAt, input.timeZone, 'dateTimeZone')}.`,
      input.tried
        ? 'You have tried it but not passed yet: have another look at the objectives your last attempt missed.'
        : 'You have not submitted a passing attempt yet.',
      `You can turn these reminders off on your profile: ${input.profileUrl}`,
    ],
    action: { label: 'Open the assignment', url: input.url },
  })
}

export interface DigestCohort {
  cohortName: string
  submissions: number
  passed: number
  /** One line per attempt with a safety violation: who, which exercise, what went wrong. */
  violations: string[]
}

export function dailyDigestMail(input: {
  to: string
  name: string
  since: string
  timeZone: string
  cohorts: DigestCohort[]
  url: string
  profileUrl: string
}): OutgoingMail {
  const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`
  const paragraphs = input.cohorts.map((c) =>
    [
      `${c.cohortName}: ${count(c.submissions, 'new submission', 'new submissions')}, ${c.passed} passed` +
        (c.violations.length
          ? `; ${count(c.violations.length, 'attempt', 'attempts')} with a safety violation:`
          : '; no safety violations.'),
      ...c.violations.map((v) => `• ${v}`),
    ].join('\n'),
  )
  return render({
    to: input.to,
    subject: 'Your Slipway digest',
    greeting: `Hello ${input.name},`,
    paragraphs: [
      `Since ${formatInZone(input.since, input.timeZone, 'dateTimeZone')}, in the cohorts you teach:`,
      ...paragraphs,
      `You can turn this digest off on your profile: ${input.profileUrl}`,
    ],
    action: { label: 'See what needs your attention', url: input.url },
  })
}
