// The admin's tools beside accounts: the outbox of the embedded mail relay, and a database backup.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ILike } from 'typeorm'
import type { z } from 'zod'
import type { OutboxPage, outboxQuerySchema } from '@shared/api/admin'
import type { AppContext } from '../context'
import { MailMessageEntity } from '../entities'
import { HttpError } from '../http-error'
import { writeBackup } from '../infrastructure/database/backup'
import { presentMail } from './mail.presenter'

type OutboxQuery = z.output<typeof outboxQuerySchema>

export async function listOutbox(ctx: AppContext, { page, pageSize, to }: OutboxQuery): Promise<OutboxPage> {
  const [rows, total] = await ctx.dataSource.getRepository(MailMessageEntity).findAndCount({
    where: to ? { toAddress: ILike(`%${to}%`) } : {},
    order: { receivedAt: 'DESC' },
    skip: (page - 1) * pageSize,
    take: pageSize,
  })
  return { items: rows.map(presentMail), total, page, pageSize }
}

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
