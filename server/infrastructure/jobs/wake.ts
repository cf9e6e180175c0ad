// Waking this process's worker as soon as a transaction that enqueued jobs commits, rather than at its next
// poll. Other instances find the jobs at their next poll. A listener only signals: the worker's own loop
// does the claiming, outside the transaction's async context (on SQLite, statements made from inside that
// context would slip past the transaction queue in infrastructure/database/sqlite-transactions.ts).
import type { DataSource, EntityManager, EntitySubscriberInterface, QueryRunner } from 'typeorm'

const listeners = new WeakMap<DataSource, Set<() => void>>()
const subscribed = new WeakSet<DataSource>()
const PENDING = 'slipwayJobsEnqueued'

function wake(dataSource: DataSource) {
  for (const listener of listeners.get(dataSource) ?? []) listener()
}

const outermostEnded = (runner: QueryRunner) => !runner.isTransactionActive

const wakeOnCommit: EntitySubscriberInterface = {
  afterTransactionCommit({ queryRunner, dataSource }) {
    if (outermostEnded(queryRunner) && queryRunner.data?.[PENDING]) {
      delete queryRunner.data[PENDING]
      wake(dataSource)
    }
  },
  afterTransactionRollback({ queryRunner }) {
    if (outermostEnded(queryRunner) && queryRunner.data) delete queryRunner.data[PENDING]
  },
}

/** Called by `enqueue`: wake now, or when the enclosing transaction commits. */
export function noteEnqueued(manager: EntityManager): void {
  const runner = manager.queryRunner
  if (runner?.isTransactionActive) {
    runner.data = { ...runner.data, [PENDING]: true }
  } else {
    wake(manager.connection)
  }
}

/** A worker listens for jobs enqueued through this data source; returns the way to stop listening. */
export function onJobsEnqueued(dataSource: DataSource, listener: () => void): () => void {
  if (!subscribed.has(dataSource)) {
    subscribed.add(dataSource)
    dataSource.subscribers.push(wakeOnCommit)
  }
  let set = listeners.get(dataSource)
  if (!set) listeners.set(dataSource, (set = new Set()))
  set.add(listener)
  return () => set.delete(listener)
}
