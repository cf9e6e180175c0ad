// Display formats used across screens, so dates and scores read the same everywhere. Dates are shown
// on the centre's clock (its time zone, an admin setting) once it is known, as in mail and CSV files.
import { ref } from 'vue'
import { formatInZone, isoToWallTime, wallTimeToIso } from '@shared/time/zone'

const browserZone = Intl.DateTimeFormat().resolvedOptions().timeZone
// A ref, so dates already on screen are drawn again when the centre's zone arrives.
const zone = ref(browserZone)

/** The centre's time zone, set when its settings load; until then the browser's own. */
export function setDisplayTimeZone(timeZone: string | null) {
  zone.value = timeZone ?? browserZone
}
export const displayTimeZone = () => zone.value

export function formatDateTime(iso: string | null | undefined): string {
  return formatInZone(iso, zone.value, 'dateTime')
}

export function formatDate(iso: string | null | undefined): string {
  return formatInZone(iso, zone.value, 'date')
}

export function formatScore(score: number | null | undefined): string {
  if (score === null || score === undefined) return '—'
  return `${Math.round(score * 10) / 10}`
}

/** Simulated time in ms as m:ss.s for evidence lines. */
export function formatSimTime(ms: number): string {
  const totalSeconds = ms / 1000
  const minutes = Math.floor(totalSeconds / 60)
  const seconds = (totalSeconds - minutes * 60).toFixed(1).padStart(4, '0')
  return `${minutes}:${seconds}`
}

/** An ISO timestamp as the value of an <input type="datetime-local">: the centre's clock, minutes. */
export function toLocalInput(iso: string): string {
  return Number.isNaN(Date.parse(iso)) ? '' : isoToWallTime(iso, zone.value)
}

/** A datetime-local value, read on the centre's clock, as an ISO instant ('' when not a time). */
export function fromLocalInput(value: string): string {
  return wallTimeToIso(value, zone.value)
}

/** The first sentences of a story, cut at a word boundary. */
export function excerpt(text: string, max = 160): string {
  const clean = text.replace(/\s+/g, ' ').trim()
  if (clean.length <= max) return clean
  const cut = clean.slice(0, max)
  return `${cut.slice(0, Math.max(cut.lastIndexOf(' '), max * 0.6))}…`
}

/** A name as part of a file name: lower-case letters and digits joined by hyphens ("Autumn intake 1" → "autumn-intake-1"). */
export function fileNamePart(name: string, fallback: string): string {
  const safe = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-|-$/g, '')
  return safe || fallback
}

/** Wall-clock minutes in words: "under a minute", "25 min", "1.5 h". */
export function formatMinutes(m: number | null | undefined): string {
  if (m === null || m === undefined) return '—'
  return m < 1 ? 'under a minute' : m < 90 ? `${Math.round(m)} min` : `${(m / 60).toFixed(1)} h`
}
