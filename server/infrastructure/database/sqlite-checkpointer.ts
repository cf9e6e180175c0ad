// Runs in a thread of its own beside a server on SQLite (see sqlite-durability.ts): with its own
// connection it checkpoints the write-ahead log into the database file every few hundred milliseconds, so
// the page copying and fsyncs of a checkpoint never hold up the event loop. PASSIVE: it never waits for,
// nor blocks, the server's own reads and writes.
import Database from 'better-sqlite3'
import { parentPort, workerData } from 'node:worker_threads'

const { path, intervalMs } = workerData as { path: string; intervalMs: number }
const db = new Database(path)
db.pragma('busy_timeout = 5000')
// NORMAL: the WAL is synced before a checkpoint copies it and the database file after.
db.pragma('synchronous = NORMAL')

const checkpoint = () => db.pragma('wal_checkpoint(PASSIVE)')
const timer = setInterval(checkpoint, intervalMs)

parentPort!.on('message', (message: unknown) => {
  if (message !== 'stop') return
  clearInterval(timer)
  checkpoint()
  db.close()
  parentPort!.postMessage('stopped')
  parentPort!.close()
})
parentPort!.postMessage('started')
