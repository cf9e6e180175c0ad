// A fixed-window hit counter shared by every API instance (the database rate-limit store).
import { EntitySchema } from 'typeorm'
import { integer, timestamp, varchar } from './columns'

export interface RateLimitCounterRow {
  /** The limiter's prefix and the client's key, e.g. `signIn:203.0.113.7`. */
  key: string
  hits: number
  /** When this window ends (ISO 8601 UTC; the next hit after it starts a new window). */
  resetAt: string
}

export const RateLimitCounterEntity = new EntitySchema<RateLimitCounterRow>({
  name: 'RateLimitCounter',
  tableName: 'rate_limit_counters',
  columns: {
    key: { ...varchar(255), primary: true },
    hits: integer,
    resetAt: timestamp,
  },
  indices: [{ name: 'idx_rate_limit_counters_reset', columns: ['resetAt'] }],
})
