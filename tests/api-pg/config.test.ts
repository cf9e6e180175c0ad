// The settings that move Slipway from one machine to several: DATABASE_URL, the shared JWT secret, where
// rate-limit counters live, the reverse proxy in front. Pure configuration: runs on either database.
import { describe, expect, it } from 'vitest'
import { ConfigError, loadConfig } from '../../server/config'
import { dataSourceOptionsFor } from '../../server/infrastructure/database/data-source'

const SECRET = 'a-shared-secret-of-enough-length-0123456789'
const PG_URL = 'postgres://slipway:pw@db.internal.example:5432/slipway'

describe('configuration for several instances', () => {
  it('opens PostgreSQL when DATABASE_URL names it', () => {
    const config = loadConfig({ DATABASE_URL: PG_URL, JWT_SECRET: SECRET })
    expect(config.database).toEqual({ driver: 'postgres', url: PG_URL, poolMax: 10 })
    expect(dataSourceOptionsFor(config)).toEqual({ postgresUrl: PG_URL, poolMax: 10 })
  })

  it('accepts the postgresql:// spelling and a pool size', () => {
    const url = PG_URL.replace('postgres:', 'postgresql:')
    const config = loadConfig({ DATABASE_URL: url, JWT_SECRET: SECRET, DATABASE_POOL_MAX: '4' })
    expect(config.database).toEqual({ driver: 'postgres', url, poolMax: 4 })
  })

  it('stays on the embedded SQLite file when DATABASE_URL is unset', () => {
    const config = loadConfig({ DATA_DIR: '/tmp/slipway-data' })
    expect(config.database).toEqual({ driver: 'sqlite', path: '/tmp/slipway-data/slipway.sqlite' })
    expect(dataSourceOptionsFor(config)).toEqual({ databasePath: '/tmp/slipway-data/slipway.sqlite' })
  })

  it('refuses PostgreSQL without a JWT_SECRET every instance shares', () => {
    expect(() => loadConfig({ DATABASE_URL: PG_URL })).toThrow(ConfigError)
    expect(() => loadConfig({ DATABASE_URL: PG_URL })).toThrow(/JWT_SECRET: must be set/)
  })

  it('names the accepted forms when DATABASE_URL is something else', () => {
    expect(() => loadConfig({ DATABASE_URL: 'mysql://db/slipway' })).toThrow(
      /DATABASE_URL must be sqlite:<path>.*postgres:\/\//,
    )
  })

  it('keeps rate-limit counters in the database on PostgreSQL and in memory on SQLite, unless told', () => {
    expect(loadConfig({ DATABASE_URL: PG_URL, JWT_SECRET: SECRET }).rateLimitStore).toBe('database')
    expect(loadConfig({}).rateLimitStore).toBe('memory')
    expect(loadConfig({ RATE_LIMIT_STORE: 'database' }).rateLimitStore).toBe('database')
    expect(() => loadConfig({ RATE_LIMIT_STORE: 'redis' })).toThrow(
      /RATE_LIMIT_STORE must be memory or database/,
    )
  })

  it('trusts forwarded addresses from loopback only, unless TRUST_PROXY names the proxy', () => {
    expect(loadConfig({}).trustProxy).toBe('loopback')
    expect(loadConfig({ TRUST_PROXY: '1' }).trustProxy).toBe(1)
    expect(loadConfig({ TRUST_PROXY: 'false' }).trustProxy).toBe(false)
    expect(loadConfig({ TRUST_PROXY: '10.0.0.5, uniquelocal' }).trustProxy).toBe('10.0.0.5, uniquelocal')
  })
})
