// One transaction at a time on SQLite, and nothing else slipped into it.
//
// TypeORM's better-sqlite3 driver has a single connection and a single query runner for the whole process.
// Its transactions are async: between two statements of one request's transaction, another request's code
// runs. Left alone, a second request's transaction then starts inside the first (SQLite refuses:
// "cannot start a transaction within a transaction", a 500) or becomes a savepoint of it, and a plain
// statement from a third request joins it — and is silently undone if the first one rolls back.
//
// So: transactions queue behind one another, and while one is open, statements from outside it wait
// until it ends. "Inside" is tracked with AsyncLocalStorage across the transaction's awaits. PostgreSQL
// gives every transaction a connection of its own and needs none of this.
//
// `durable` (sqlite-durability.ts) is awaited after every commit that wrote something — a transaction's, or
// a write statement's outside one — before the caller sees the result; a transaction waits for it after
// letting the next one in, so commits that wait together share one sync.
import { AsyncLocalStorage } from 'node:async_hooks'
import type { DataSource, EntityManager, QueryRunner } from 'typeorm'

/** Statements that cannot have written anything. */
const READ_ONLY = /^\s*(SELECT|PRAGMA|EXPLAIN)\b/i
/** Statements that open or close a transaction: writing nothing themselves. */
const TRANSACTION_CONTROL = /^\s*(BEGIN|COMMIT|END|ROLLBACK|SAVEPOINT|RELEASE)\b/i

interface Inside {
  /** Whether a statement of this transaction may have changed the database. */
  wrote: boolean
}

export function serializeSqliteTransactions(
  dataSource: DataSource,
  durable: () => Promise<void> = async () => {},
): void {
  if (dataSource.options.type !== 'better-sqlite3') return
  const inside = new AsyncLocalStorage<Inside>()
  /** Settles when the open transaction ends; null when none is open. */
  let open: Promise<void> | null = null

  const manager = dataSource.manager
  const transaction = manager.transaction.bind(manager) as (...args: unknown[]) => Promise<unknown>
  manager.transaction = async function serialTransaction(...args: unknown[]) {
    // A transaction inside a transaction is TypeORM's savepoint, on the same work: no queueing.
    if (inside.getStore()) return transaction(...args)
    while (open) await open
    let end!: () => void
    open = new Promise<void>((resolve) => (end = resolve))
    let result: unknown
    const work: Inside = { wrote: false }
    try {
      result = await inside.run(work, () => transaction(...args))
    } finally {
      open = null
      end()
    }
    if (work.wrote) await durable()
    return result
  } as EntityManager['transaction']

  // The driver hands out this one runner to every caller (repositories, the query builder, raw queries).
  const runner: QueryRunner = dataSource.driver.createQueryRunner('master')
  const query = runner.query.bind(runner) as (...args: unknown[]) => Promise<unknown>
  const connection = (dataSource.driver as unknown as { databaseConnection: { inTransaction: boolean } })
    .databaseConnection
  runner.query = async function serialQuery(...args: unknown[]) {
    const within = inside.getStore()
    while (open && !within) await open
    const sql = String(args[0])
    const result = await query(...args)
    if (within) {
      if (!READ_ONLY.test(sql) && !TRANSACTION_CONTROL.test(sql)) within.wrote = true
    } else if (!connection.inTransaction && !READ_ONLY.test(sql)) {
      // A write that committed on its own (or TypeORM's own COMMIT outside our transactions) is synced here.
      await durable()
    }
    return result
  } as QueryRunner['query']
}
