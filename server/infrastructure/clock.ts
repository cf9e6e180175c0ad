// Time helpers: timestamps are ISO strings everywhere in the database. The clock is injectable so tests
// can move time past a due date (setClock) without waiting for it.
let source: () => number = Date.now

/** Milliseconds since the epoch, from the current clock. */
export const nowMs = () => source()
export const nowIso = () => new Date(source()).toISOString()
export const isoIn = (ms: number) => new Date(source() + ms).toISOString()
export const HOUR = 3_600_000
export const DAY = 24 * HOUR

/** Replaces the clock (tests); `null` puts the real one back. */
export function setClock(next: (() => number) | null): void {
  source = next ?? Date.now
}
