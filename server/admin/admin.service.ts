// The admin's tools beside accounts: a database backup (the outbox is in outbox.service.ts).
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import type { AppContext } from '../context'
import { HttpError } from '../http-error'
import { writeBackup } from '../infrastructure/database/backup'

/** A backup in a fresh temporary file; `remove` deletes it once it has been sent. */
export interface BackupFile {
  path: string
  remove(): void
}

/** A consistent SQLite copy made while the app keeps running (from PostgreSQL too: infrastructure/database/backup.ts). */
export async function makeBackup(ctx: AppContext): Promise<BackupFile> {
  const dir = mkdtempSync(join(tmpdir(), 'slipway-backup-'))
  const remove = () => rmSync(dir, { recursive: true, force: true })
  const path = join(dir, 'slipway.sqlite')
  try {
    await writeBackup(ctx.dataSource, path)
  } catch (err) {
    remove()
    ctx.log.error({ err }, 'backup failed')
    throw new HttpError(500, 'internal_error', 'The backup could not be made')
  }
  return { path, remove }
}
