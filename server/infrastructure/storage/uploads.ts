// Upload handling: multer in memory with a size cap, a type check against name, MIME type and content,
// then the accepted file is kept under DATA_DIR/uploads with a generated name, once its row has committed.
import { randomUUID } from 'node:crypto'
import { closeSync, fsyncSync, mkdirSync, openSync, renameSync, rmSync, writeSync } from 'node:fs'
import { extname, join } from 'node:path'
import multer from 'multer'
import type { EntityManager } from 'typeorm'
import type { AppContext } from '../../context'
import { UploadEntity, type UploadRow } from '../../entities'
import { HttpError } from '../../http-error'
import { asMiddleware, type Middleware } from '../../middleware/validate'
import { nowIso } from '../clock'

export interface UploadKind {
  purpose: UploadRow['purpose']
  field: string
  maxBytes: number
  extensions: string[]
  mimeTypes: string[]
  label: string
}

export function uploadMiddleware(kind: UploadKind): Middleware {
  return asMiddleware(
    multer({
      storage: multer.memoryStorage(),
      limits: { fileSize: kind.maxBytes, files: 1, fields: 5 },
    }).single(kind.field),
  )
}

/** The uploaded file as UTF-8 text, after checking it is what it claims to be (415 if not). */
export function uploadedText(
  req: { file?: Express.Multer.File },
  kind: UploadKind,
): { file: Express.Multer.File; text: string } {
  const file = req.file
  if (!file) {
    throw new HttpError(400, 'validation_failed', `Attach the ${kind.label} as the “${kind.field}” field`, {
      fields: { [kind.field]: ['A file is required'] },
    })
  }
  const extension = extname(file.originalname).toLowerCase()
  const mime = file.mimetype.split(';')[0]!.trim().toLowerCase()
  if (!kind.extensions.includes(extension) || !kind.mimeTypes.includes(mime)) {
    throw new HttpError(
      415,
      'unsupported_media_type',
      `The ${kind.label} must be a ${kind.extensions.join(' or ')} file`,
      {
        received: { name: file.originalname, type: mime },
      },
    )
  }
  const text = new TextDecoder('utf-8', { fatal: false }).decode(file.buffer)
  if (text.includes('\u0000') || text.includes('\uFFFD')) {
    throw new HttpError(415, 'unsupported_media_type', `The ${kind.label} is not UTF-8 text`)
  }
  return { file, text }
}

/** Where uploads are kept, and the staging folder inside for files whose transaction has not committed. */
export function uploadFolders(dataDir: string) {
  const kept = join(dataDir, 'uploads')
  return { kept, staging: join(kept, '.staging') }
}

/** Writes the bytes and flushes them to disk before anything points at them. */
function writeDurably(path: string, bytes: Buffer) {
  const fd = openSync(path, 'wx')
  try {
    writeSync(fd, bytes)
    fsyncSync(fd)
  } finally {
    closeSync(fd)
  }
}

/**
 * Runs `work` in a transaction that also records the uploaded file. The file is written to the staging folder
 * first and moved into place only once the transaction has committed: a rolled-back change leaves no file,
 * and a crash in between leaves a staged file that the sweep (upload-sweep.ts) moves into place or removes.
 */
export async function inTransactionWithUpload<T>(
  ctx: AppContext,
  userId: string,
  kind: UploadKind,
  file: Express.Multer.File,
  work: (manager: EntityManager) => Promise<T>,
): Promise<T> {
  const folders = uploadFolders(ctx.config.dataDir)
  mkdirSync(folders.staging, { recursive: true })
  const id = randomUUID()
  const storedName = `${id}${extname(file.originalname).toLowerCase()}`
  const staged = join(folders.staging, storedName)
  writeDurably(staged, file.buffer)
  let result: T
  try {
    result = await ctx.dataSource.transaction(async (manager) => {
      const outcome = await work(manager)
      await manager.getRepository(UploadEntity).insert({
        id,
        userId,
        purpose: kind.purpose,
        originalName: file.originalname.slice(0, 255),
        storedName,
        mimeType: file.mimetype.slice(0, 120),
        size: file.size,
        createdAt: nowIso(),
      })
      return outcome
    })
  } catch (error) {
    rmSync(staged, { force: true })
    throw error
  }
  try {
    renameSync(staged, join(folders.kept, storedName))
  } catch (err) {
    // Committed: the sweep finishes the move; the request has succeeded.
    ctx.log.error({ err, storedName }, 'could not move an upload into place; the next sweep will')
  }
  return result
}
