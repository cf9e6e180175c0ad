// Plain-words formatting of times and values for grading evidence.

/** Simulated ms as mm:ss.d (hh:mm:ss.d past an hour), e.g. 42300 → "00:42.3". */
export function formatTime(ms: number): string {
  const tenths = Math.round(ms / 100)
  const totalSeconds = Math.floor(tenths / 10)
  const d = tenths % 10
  const s = totalSeconds % 60
  const totalMinutes = Math.floor(totalSeconds / 60)
  const m = totalMinutes % 60
  const h = Math.floor(totalMinutes / 60)
  const mmss = `${String(m).padStart(2, '0')}:${String(s).padStart(2, '0')}.${d}`
  return h > 0 ? `${h}:${mmss}` : mmss
}

export function formatNumber(value: number, digits = 1): string {
  const rounded = Number(value.toFixed(digits))
  return String(Object.is(rounded, -0) ? 0 : rounded)
}

export function formatVolts(volts: number): string {
  return `${formatNumber(volts, Math.abs(volts) >= 100 ? 0 : 1)} V`
}

export function formatHz(hz: number): string {
  return `${formatNumber(hz, 1)} Hz`
}

export function formatRpm(rpm: number): string {
  return `${formatNumber(rpm, 0)} rpm`
}

export function formatSeconds(ms: number): string {
  return `${formatNumber(ms / 1000, 1)} s`
}

/** Joins notice texts (which end with a full stop) into one sentence without doubled stops. */
export function joinTexts(texts: string[]): string {
  return texts.map((t) => t.replace(/\.+$/, '')).join('; ')
}

export function lowerFirst(text: string): string {
  return text.charAt(0).toLowerCase() + text.slice(1)
}

export function upperFirst(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1)
}

export function plural(count: number, one: string, many = `${one}s`): string {
  return `${count} ${count === 1 ? one : many}`
}
