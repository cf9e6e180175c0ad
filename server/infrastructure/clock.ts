// Time helpers: timestamps are ISO strings everywhere in the database.
export const nowIso = () => new Date().toISOString()
export const isoIn = (ms: number) => new Date(Date.now() + ms).toISOString()
export const HOUR = 3_600_000
export const DAY = 24 * HOUR
