// Durable commits on SQLite without blocking the event loop.
//
// better-sqlite3 is synchronous: with `synchronous = FULL` every COMMIT waits on the event loop for the fsync
// of the write-ahead log (milliseconds each, more on a busy disk), and every automatic checkpoint copies pages
// and fsyncs the database file there too. Instead the connection runs at NORMAL — a COMMIT only appends its
// frames to the WAL — and before a commit is reported to the caller, the WAL file is fdatasync'ed from
// libuv's thread pool. That is what FULL does in WAL mode ("the WAL file is synchronized after each
// transaction commit", sqlite.org, PRAGMA synchronous), so an acknowledged grade still survives a power cut,
// and commits waiting at the same time share one sync (group commit). Checkpoints run in a thread of their
// own with their own connection (sqlite-checkpointer.ts).
import { once } from 'node:events'
import { open, type FileHandle } from 'node:fs/promises'
import { Worker } from 'node:worker_threads'
import { workerFile } from '../worker-file'

export interface WalSync {
  /** Resolves once everything committed before the call is on disk. */
  committed(): Promise<void>
  close(): Promise<void>
}

/** `datasync` is replaceable so a test can count and hold the syncs. */
export function createWalSync(
  walPath: string,
  datasync: (file: FileHandle) => Promise<void> = (file) => file.datasync(),
): WalSync {
  let handle: Promise<FileHandle> | undefined
  /** Commits asked for so far, and the highest of them a finished sync covers. */
  let requested = 0
  let synced = 0
  let running = false
  const waiting: { ticket: number; resolve: () => void; reject: (error: unknown) => void }[] = []

  async function pump() {
    if (running) return
    running = true
    try {
      while (synced < requested) {
        // A sync that starts now covers every commit made before it started.
        const covers = requested
        try {
          // SQLite creates the WAL with the connection; it stays the same file while the connection is open.
          handle ??= open(walPath, 'r')
          await datasync(await handle)
          synced = covers
          settle(covers, (w) => w.resolve())
        } catch (error) {
          synced = covers
          settle(covers, (w) => w.reject(error))
        }
      }
    } finally {
      running = false
    }
  }

  function settle(upTo: number, done: (w: (typeof waiting)[number]) => void) {
    while (waiting.length && waiting[0]!.ticket <= upTo) done(waiting.shift()!)
  }

  return {
    committed() {
      const ticket = ++requested
      return new Promise<void>((resolve, reject) => {
        waiting.push({ ticket, resolve, reject })
        void pump()
      })
    },
    async close() {
      while (running || synced < requested) await new Promise((r) => setTimeout(r, 1))
      await (await handle?.catch(() => undefined))?.close()
    },
  }
}

/**
 * Starts the checkpointing thread for the database at `path`; the returned function stops it (after one
 * last checkpoint). Should the thread fail, the connection's own automatic checkpoint still bounds the log.
 */
export async function startBackgroundCheckpoints(path: string, intervalMs = 250): Promise<() => Promise<void>> {
  const worker = new Worker(await workerFile('sqlite-checkpointer'), {
    workerData: { path, intervalMs },
    execArgv: [],
  })
  let failed = false
  worker.on('error', (error) => {
    failed = true
    process.emitWarning(`SQLite checkpoints stopped in their thread: ${error.message}`)
  })
  await once(worker, 'message')
  return async () => {
    if (failed || worker.threadId === -1) return
    const exited = once(worker, 'exit')
    worker.postMessage('stop')
    await exited
  }
}
