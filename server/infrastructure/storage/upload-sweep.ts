// Tidies DATA_DIR/uploads against the uploads table: a staged file whose row committed (the process stopped
// before moving it) is moved into place; a staged file without a row, once older than any transaction, is
// removed (its transaction rolled back or never ended); so is an old kept file without a row (its uploader's
// account was deleted, or an older version crashed mid-upload). Runs at start and as an hourly job.
import { existsSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs'
import { join } from 'node:path'
import type { DataSource } from 'typeorm'
import { z } from 'zod'
import { UploadEntity } from '../../entities'
import { defineJobKind } from '../jobs'
import type { Logger } from '../logging'
import { uploadFolders } from './uploads'

/** No transaction stays open this long: a staged file older than this without a row is an orphan. */
export const STAGED_GRACE_MS = 60 * 60_000

export interface SweepResult {
  /** Staged files whose row had committed, now in place. */
  placed: number
  /** Files without a row, removed. */
  removed: number
  /** Rows whose file is nowhere (nothing to do but say so). */
  missing: number
}

const filesIn = (dir: string) =>
  existsSync(dir)
    ? readdirSync(dir, { withFileTypes: true })
        .filter((e) => e.isFile())
        .map((e) => e.name)
    : []

export async function sweepUploads(
  ds: DataSource,
  dataDir: string,
  log: Logger,
  now = new Date(),
): Promise<SweepResult> {
  const { kept, staging } = uploadFolders(dataDir)
  const known = new Set(
    (await ds.getRepository(UploadEntity).find({ select: { storedName: true } })).map((u) => u.storedName),
  )
  const old = (path: string) => now.getTime() - statSync(path).mtimeMs > STAGED_GRACE_MS
  const result: SweepResult = { placed: 0, removed: 0, missing: 0 }
  for (const name of filesIn(staging)) {
    const path = join(staging, name)
    if (known.has(name)) {
      renameSync(path, join(kept, name))
      result.placed++
    } else if (old(path)) {
      rmSync(path, { force: true })
      result.removed++
    }
  }
  const present = new Set(filesIn(kept))
  for (const name of present) {
    // Old ones only: a file moved into place just after `known` was read has its row by now.
    if (!known.has(name) && old(join(kept, name))) {
      rmSync(join(kept, name), { force: true })
      result.removed++
    }
  }
  for (const name of known) if (!present.has(name)) result.missing++
  if (result.placed || result.removed || result.missing) log.info(result, 'uploads swept')
  if (result.missing) log.warn({ missing: result.missing }, 'some recorded uploads have no file')
  return result
}

export const sweepUploadsJob = defineJobKind({
  kind: 'uploads.sweep',
  payload: z.object({}),
  retry: { maxAttempts: 3, firstDelayMs: 60_000 },
})
