// Words and numbers as the records print them. Every date is formatted in a time zone the caller names
// (the centre's), never the server's own.
import { settingDef, type SettingKey, type SettingValue } from '@shared/model'
import { assistanceLabel, formatTime, type AssistanceLevel } from '@shared/scenario'

export interface Clock {
  /** IANA time zone, e.g. "Europe/London". */
  timeZone: string
  /** BCP 47 locale for dates, e.g. "en-GB". */
  locale: string
}

/** "12 Mar 2026, 14:05 GMT" in the given zone. */
export function formatDateTime(iso: string, clock: Clock): string {
  return new Intl.DateTimeFormat(clock.locale, {
    timeZone: clock.timeZone,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZoneName: 'short',
  }).format(new Date(iso))
}

/** "12 Mar 2026" in the given zone. */
export function formatDate(iso: string, clock: Clock): string {
  return new Intl.DateTimeFormat(clock.locale, {
    timeZone: clock.timeZone,
    day: 'numeric',
    month: 'short',
    year: 'numeric',
  }).format(new Date(iso))
}

/** Simulated time in the attempt, as all evidence writes it ("01:27.2"). */
export const formatAttemptTime = formatTime

/** A duration in words: "1 h 05 min", "12 min 30 s", "45 s". */
export function formatDuration(ms: number): string {
  const total = Math.max(0, Math.round(ms / 1000))
  const h = Math.floor(total / 3600)
  const m = Math.floor((total % 3600) / 60)
  const s = total % 60
  if (h > 0) return `${h} h ${String(m).padStart(2, '0')} min`
  if (m > 0) return `${m} min ${String(s).padStart(2, '0')} s`
  return `${s} s`
}

/** A setting's value in the catalogue's words and units: "10 s", "Raise / lower inputs", "Yes". */
export function formatSettingValue(key: SettingKey, value: SettingValue | undefined): string {
  if (value === undefined) return '—'
  const def = settingDef(key)
  if (def.kind === 'boolean') return value === true ? 'Yes' : 'No'
  if (def.kind === 'number') return def.unit ? `${value} ${def.unit}` : String(value)
  const option = def.options.find((o) => o.value === value)
  return option ? option.label : String(value)
}

/** Each level's label for the paperwork (shared/scenario/assistance.ts holds the one definition). */
export const ASSISTANCE_LEVELS: Record<AssistanceLevel, string> = {
  guided: assistanceLabel('guided'),
  standard: assistanceLabel('standard'),
  assessment: assistanceLabel('assessment'),
}
export type { AssistanceLevel }

export function formatScore(score: number): string {
  return `${Math.round(score)} %`
}
