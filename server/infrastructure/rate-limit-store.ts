// An express-rate-limit store in the application database (SQLite or PostgreSQL): fixed windows like the
// library's MemoryStore, but every API instance reads and bumps the same counter with one atomic upsert.
import type { ClientRateLimitInfo, Options, Store } from 'express-rate-limit'
import type { DataSource } from 'typeorm'
import { RateLimitCounterEntity } from '../entities'
import { isPostgres } from './database/data-source'

const TABLE = '"rate_limit_counters"'
/** Expired rows are swept every this many hits, so the table holds roughly the live windows only. */
const PRUNE_EVERY = 200

export class DatabaseRateLimitStore implements Store {
  readonly localKeys = false
  readonly prefix: string
  private windowMs = 60_000
  private hitsSincePrune = 0

  constructor(
    private readonly dataSource: DataSource,
    limiterName: string,
  ) {
    this.prefix = `${limiterName}:`
  }

  init(options: Options) {
    this.windowMs = options.windowMs
  }

  /** `$1` on PostgreSQL, `?` on SQLite (the SQL itself is the same on both). */
  private param(index: number) {
    return isPostgres(this.dataSource) ? `$${index}` : '?'
  }

  private key(clientKey: string) {
    return (this.prefix + clientKey).slice(0, 255)
  }

  async get(clientKey: string): Promise<ClientRateLimitInfo | undefined> {
    const row = await this.dataSource
      .getRepository(RateLimitCounterEntity)
      .findOneBy({ key: this.key(clientKey) })
    if (!row || row.resetAt <= new Date().toISOString()) return undefined
    return { totalHits: row.hits, resetTime: new Date(row.resetAt) }
  }

  async increment(clientKey: string): Promise<ClientRateLimitInfo> {
    const now = new Date()
    const nextReset = new Date(now.getTime() + this.windowMs).toISOString()
    const p = (i: number) => this.param(i)
    // One statement, so two instances counting the same client at once cannot lose a hit; the SET
    // expressions all read the row as it was, so the window and the count restart together.
    const sql =
      `INSERT INTO ${TABLE} ("key", "hits", "resetAt") VALUES (${p(1)}, 1, ${p(2)}) ` +
      `ON CONFLICT ("key") DO UPDATE SET ` +
      `"hits" = CASE WHEN ${TABLE}."resetAt" <= ${p(3)} THEN 1 ELSE ${TABLE}."hits" + 1 END, ` +
      `"resetAt" = CASE WHEN ${TABLE}."resetAt" <= ${p(4)} THEN excluded."resetAt" ELSE ${TABLE}."resetAt" END ` +
      `RETURNING "hits", "resetAt"`
    const iso = now.toISOString()
    const rows = (await this.dataSource.query(sql, [this.key(clientKey), nextReset, iso, iso])) as {
      hits: number | string
      resetAt: string
    }[]
    if (++this.hitsSincePrune >= PRUNE_EVERY) {
      this.hitsSincePrune = 0
      await this.prune(iso)
    }
    const row = rows[0]!
    return { totalHits: Number(row.hits), resetTime: new Date(row.resetAt) }
  }

  async decrement(clientKey: string): Promise<void> {
    await this.dataSource
      .createQueryBuilder()
      .update(RateLimitCounterEntity)
      .set({ hits: () => '"hits" - 1' })
      .where('"key" = :key AND "hits" > 0', { key: this.key(clientKey) })
      .execute()
  }

  async resetKey(clientKey: string): Promise<void> {
    await this.dataSource.getRepository(RateLimitCounterEntity).delete({ key: this.key(clientKey) })
  }

  async resetAll(): Promise<void> {
    await this.dataSource
      .createQueryBuilder()
      .delete()
      .from(RateLimitCounterEntity)
      .where('"key" LIKE :prefix', { prefix: `${this.prefix}%` })
      .execute()
  }

  private async prune(nowIso: string) {
    await this.dataSource
      .createQueryBuilder()
      .delete()
      .from(RateLimitCounterEntity)
      .where('"resetAt" <= :now', { now: nowIso })
      .execute()
  }
}
