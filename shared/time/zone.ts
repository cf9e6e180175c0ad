// Dates in the centre's time zone (an IANA name such as "Europe/London"), with the platform's Intl API:
// the same words on screen, in mail and in CSV, whatever the time zone of the server or the browser.

const formatters = new Map<string, Intl.DateTimeFormat>()

function formatter(timeZone: string, style: DateStyle): Intl.DateTimeFormat {
  const key = `${timeZone}|${style}`
  let format = formatters.get(key)
  if (!format) {
    format = new Intl.DateTimeFormat('en-GB', { timeZone, ...STYLES[style] })
    formatters.set(key, format)
  }
  return format
}

export type DateStyle = 'dateTime' | 'date' | 'dateTimeZone' | 'time'

const STYLES: Record<DateStyle, Intl.DateTimeFormatOptions> = {
  dateTime: { dateStyle: 'medium', timeStyle: 'short' },
  date: { dateStyle: 'medium' },
  // For mail and files read away from the screen: the zone's short name says which clock it is.
  dateTimeZone: {
    day: 'numeric',
    month: 'short',
    year: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    timeZoneName: 'short',
  },
  time: { hour: '2-digit', minute: '2-digit' },
}

export const DEFAULT_TIME_ZONE = 'UTC'

/** True for a time zone name this platform knows (IANA names, and UTC). */
export function isTimeZone(name: string): boolean {
  if (!name || name.length > 64) return false
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: name })
    return true
  } catch {
    return false
  }
}

/** Every IANA time zone name the platform knows, for a picker. */
export function timeZoneNames(): string[] {
  const names = Intl.supportedValuesOf('timeZone')
  return names.includes('UTC') ? names : ['UTC', ...names]
}

/** An ISO instant as people read it in the given time zone; '—' for nothing. */
export function formatInZone(
  iso: string | null | undefined,
  timeZone: string,
  style: DateStyle = 'dateTime',
): string {
  if (!iso) return '—'
  const ms = Date.parse(iso)
  if (Number.isNaN(ms)) return '—'
  return formatter(timeZone, style).format(ms)
}

/** The wall-clock fields of an instant in a time zone. */
function wallClock(ms: number, timeZone: string) {
  const parts = new Intl.DateTimeFormat('en-US', {
    timeZone,
    hourCycle: 'h23',
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    second: '2-digit',
  }).formatToParts(ms)
  const field = (type: string) => Number(parts.find((p) => p.type === type)?.value ?? 0)
  return {
    year: field('year'),
    month: field('month'),
    day: field('day'),
    hour: field('hour'),
    minute: field('minute'),
    second: field('second'),
  }
}

/** Minutes the zone is ahead of UTC at that instant (London in summer: 60). */
export function zoneOffsetMinutes(ms: number, timeZone: string): number {
  const w = wallClock(ms, timeZone)
  const asUtc = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second)
  return Math.round((asUtc - Math.floor(ms / 1000) * 1000) / 60_000)
}

/**
 * "2027-03-28T17:00" read on the centre's clock → the ISO instant. A wall time that does not exist (the
 * hour skipped when clocks go forward) lands after the gap; one that happens twice takes the first.
 */
export function wallTimeToIso(wall: string, timeZone: string): string {
  const m = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/.exec(wall)
  if (!m) return ''
  const asUtc = Date.UTC(+m[1]!, +m[2]! - 1, +m[3]!, +m[4]!, +m[5]!)
  // Two passes settle the offset on either side of a change of clocks.
  let guess = asUtc - zoneOffsetMinutes(asUtc, timeZone) * 60_000
  guess = asUtc - zoneOffsetMinutes(guess, timeZone) * 60_000
  const earlier = asUtc - zoneOffsetMinutes(guess - 3_600_000, timeZone) * 60_000
  if (earlier < guess && isoToWallTime(new Date(earlier).toISOString(), timeZone) === wall) guess = earlier
  return new Date(guess).toISOString()
}

/** An ISO instant as "YYYY-MM-DDTHH:mm" on the zone's clock (the value of a datetime-local input). */
export function isoToWallTime(iso: string, timeZone: string): string {
  const w = wallClock(Date.parse(iso), timeZone)
  const pad = (n: number) => String(n).padStart(2, '0')
  return `${w.year}-${pad(w.month)}-${pad(w.day)}T${pad(w.hour)}:${pad(w.minute)}`
}

/** The calendar date ("YYYY-MM-DD") of an instant on the zone's clock, e.g. for file names. */
export function zonedDate(iso: string, timeZone: string): string {
  return isoToWallTime(iso, timeZone).slice(0, 10)
}
