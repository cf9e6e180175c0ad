// Class insight in sentences: the lists beside the charts, and the charts' accessible names.
import type { ObjectiveMiss, SafetyKindCount, ToPass } from '@shared/api'
import { formatMinutes } from '@/composables/format'

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`
export const percent = (share: number | null) => (share === null ? '—' : `${Math.round(share * 100)} %`)

export function objectiveLine(o: ObjectiveMiss): string {
  if (!o.graded) return 'nobody graded on it yet'
  return `missed in ${o.missed} of ${plural(o.graded, 'attempt')} (${percent(o.missRate)}) · ${
    o.notMetBy ? `not met yet by ${plural(o.notMetBy, 'apprentice')}` : 'met by everyone who tried'
  }`
}

export const safetyLine = (s: SafetyKindCount) =>
  `${plural(s.violations, 'time')} in ${plural(s.attempts, 'attempt')}, by ${plural(s.apprentices, 'apprentice')}`

export function toPassLine(t: ToPass): string {
  if (!t.passed) return 'Nobody has passed yet.'
  return `Passed by ${plural(t.passed, 'apprentice')}: typically at attempt ${formatCount(t.medianAttempts)}, after ${formatMinutes(t.medianMinutes)} at the bench (the median).`
}

/** A median of counts may be a half: 1.5 attempts. */
export const formatCount = (n: number | null) =>
  n === null ? '—' : Number.isInteger(n) ? String(n) : n.toFixed(1)

export const missedSummary = (objectives: ObjectiveMiss[]) =>
  `Share of attempts that missed each objective: ${objectives.map((o) => `${o.title}, ${percent(o.missRate)}`).join('; ')}`

export const byAttemptsSummary = (t: ToPass) =>
  `Apprentices by the attempt at which they passed: ${t.byAttempts.map((b) => `${b.label}, ${b.apprentices}`).join('; ')}`

export const safetySummary = (safety: SafetyKindCount[]) =>
  `Safety violations by kind: ${safety.map((s) => `${s.label}, ${s.violations}`).join('; ')}`
