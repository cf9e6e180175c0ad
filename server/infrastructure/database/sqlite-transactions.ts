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
import { AsyncLocalStorage } from 'node:async_hooks'
import type { DataSource, EntityManager, QueryRunner } from 'typeorm'

export function serializeSqliteTransactions(dataSource: DataSource): void {
  if (dataSource.options.type !== 'better-sqlite3') return
  const inside = new AsyncLocalStorage<true>()
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
    try {
      return await inside.run(true, () => transaction(...args))
    } finally {
      open = null
      end()
    }
  } as EntityManager['transaction']

  // The driver hands out this one runner to every caller (repositories, the query builder, raw queries).
  const runner: QueryRunner = dataSource.driver.createQueryRunner('master')
  const query = runner.query.bind(runner) as (...args: unknown[]) => Promise<unknown>
  runner.query = async function serialQuery(...args: unknown[]) {
    while (open && !inside.getStore()) await open
    return query(...args)
  } as QueryRunner['query']
}
