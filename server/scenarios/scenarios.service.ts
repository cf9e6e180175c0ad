// Scenarios and their versions: a new key starts at version 1; an update is the next version, never an
// edit. Everyone signed in reads; staff create, update, duplicate, retire and upload packs.
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { DataSource, EntityManager } from 'typeorm'
import type { z } from 'zod'
import {
  SCENARIO_PACK_FIELD,
  SCENARIO_PACK_MAX_BYTES,
  scenarioPackSchema,
  type DuplicateScenarioRequest,
  type ScenarioDetail,
  type ScenarioLibraryItem,
  type ScenarioStatus,
  type ScenarioSummary,
  type scenarioListQuerySchema,
} from '@shared/api/scenarios'
import { scenarioSchema, type Scenario } from '@shared/scenario/schema'
import type { AppContext } from '../context'
import { ScenarioEntity, type ScenarioRow, type UserRow } from '../entities'
import { HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { inTransactionWithUpload, uploadedText, type UploadKind } from '../infrastructure/storage/uploads'
import { presentLibraryItem, presentScenario, presentScenarioDetail } from './scenario.presenter'
import { checkScenarioDocument } from './scenario-check'

export const PACK_UPLOAD: UploadKind = {
  purpose: 'scenarioPack',
  field: SCENARIO_PACK_FIELD,
  maxBytes: SCENARIO_PACK_MAX_BYTES,
  extensions: ['.json'],
  mimeTypes: ['application/json', 'text/json', 'text/plain'],
  label: 'scenario pack',
}

type ScenarioListQuery = z.output<typeof scenarioListQuerySchema>

export async function latestVersion(
  manager: EntityManager | DataSource,
  key: string,
): Promise<ScenarioRow | null> {
  return manager.getRepository(ScenarioEntity).findOne({ where: { key }, order: { version: 'DESC' } })
}

/** Validates the document's meaning (beyond its shape) and stores it as the next version of its key. */
export async function storeScenarioVersion(
  manager: EntityManager,
  document: Scenario,
  createdById: string | null,
  expect: 'new' | 'existing' | 'either',
  problemPathPrefix = '',
): Promise<{ row: ScenarioRow; created: boolean }> {
  checkScenarioDocument(document, problemPathPrefix)
  const previous = await latestVersion(manager, document.id)
  if (previous && expect === 'new') {
    throw new HttpError(
      409,
      'conflict',
      `A scenario with the id “${document.id}” already exists; update it instead`,
      {
        fields: { id: ['Already in use'] },
      },
    )
  }
  if (!previous && expect === 'existing') throw new HttpError(404, 'not_found', 'Scenario not found')
  const version = (previous?.version ?? 0) + 1
  const row: ScenarioRow = {
    id: randomUUID(),
    key: document.id,
    version,
    title: document.title,
    status: 'active',
    document: JSON.stringify({ ...document, version }),
    createdById,
    createdAt: nowIso(),
  }
  await manager.getRepository(ScenarioEntity).insert(row)
  return { row, created: !previous }
}

/**
 * The scenarios shipped in scenarios/*.json; each key missing from the database is added as version 1.
 * A file that fails its checks is skipped and reported, so one bad file cannot stop the server.
 */
export async function importShippedScenarios(
  dataSource: DataSource,
  dir: string,
): Promise<{ added: number; skipped: { file: string; problem: string }[] }> {
  let added = 0
  const skipped: { file: string; problem: string }[] = []
  const files = readdirSync(dir)
    .filter((name) => name.endsWith('.json'))
    .sort()
  for (const file of files) {
    try {
      const document = scenarioSchema.parse(JSON.parse(readFileSync(join(dir, file), 'utf8')))
      await dataSource.transaction(async (manager) => {
        if (await latestVersion(manager, document.id)) return
        await storeScenarioVersion(manager, document, null, 'new')
        added++
      })
    } catch (error) {
      const details = error instanceof HttpError ? JSON.stringify(error.details) : ''
      skipped.push({ file, problem: `${(error as Error).message} ${details}`.trim() })
    }
  }
  return { added, skipped }
}

async function latestOrThrow(ctx: AppContext, key: string): Promise<ScenarioRow> {
  const row = await latestVersion(ctx.dataSource, key)
  if (!row) throw notFound('Scenario')
  return row
}

/**
 * The newest version of each key, by title; apprentices only ever see what can still be practised.
 * A shipped scenario the centre has changed since stays "shipped" (its version says how often).
 */
export async function listScenarios(
  ctx: AppContext,
  user: UserRow,
  { includeRetired }: ScenarioListQuery,
): Promise<ScenarioLibraryItem[]> {
  const rows = await ctx.dataSource
    .getRepository(ScenarioEntity)
    .find({ order: { key: 'ASC', version: 'DESC' } })
  const showRetired = includeRetired && user.role !== 'apprentice'
  const items: ScenarioLibraryItem[] = []
  rows.forEach((row, i) => {
    if (i > 0 && rows[i - 1]!.key === row.key) return // an older version
    if (!showRetired && row.status !== 'active') return
    let first = i
    while (rows[first + 1]?.key === row.key) first++
    items.push(presentLibraryItem(row, rows[first]!))
  })
  return items.sort((a, b) => byTitle.compare(a.title, b.title) || a.key.localeCompare(b.key))
}

const byTitle = new Intl.Collator('en', { sensitivity: 'base', numeric: true })

export async function createScenario(
  ctx: AppContext,
  user: UserRow,
  document: Scenario,
): Promise<ScenarioDetail> {
  const { row } = await ctx.dataSource.transaction((m) => storeScenarioVersion(m, document, user.id, 'new'))
  return presentScenarioDetail(row)
}

/** A pack of one document or an array of them: each a new key or the next version; all or nothing. */
export async function uploadScenarioPack(
  ctx: AppContext,
  user: UserRow,
  upload: Express.Multer.File | undefined,
): Promise<{ scenario: ScenarioSummary; created: boolean }[]> {
  const { file, text } = uploadedText({ file: upload }, PACK_UPLOAD)
  let json: unknown
  try {
    json = JSON.parse(text)
  } catch {
    throw new HttpError(415, 'unsupported_media_type', 'The scenario pack is not valid JSON')
  }
  // Parse by the shape given, so an error names its place: `1.id` is the second scenario's id.
  const documents = Array.isArray(json)
    ? scenarioPackSchema.options[1].parse(json)
    : [scenarioPackSchema.options[0].parse(json)]
  const items = await inTransactionWithUpload(ctx, user.id, PACK_UPLOAD, file, async (manager) => {
    const stored = []
    for (const [index, document] of documents.entries()) {
      const prefix = Array.isArray(json) ? `[${index}]` : ''
      stored.push(await storeScenarioVersion(manager, document, user.id, 'either', prefix))
    }
    return stored
  })
  return items.map(({ row, created }) => ({ scenario: presentScenario(row), created }))
}

export async function getLatestScenario(
  ctx: AppContext,
  user: UserRow,
  key: string,
): Promise<ScenarioDetail> {
  const row = await latestOrThrow(ctx, key)
  if (row.status === 'retired' && user.role === 'apprentice') throw notFound('Scenario')
  return presentScenarioDetail(row)
}

/** The document becomes the key's next version. */
export async function updateScenario(
  ctx: AppContext,
  user: UserRow,
  key: string,
  document: Scenario,
): Promise<ScenarioDetail> {
  if (document.id !== key) {
    throw new HttpError(400, 'validation_failed', 'The document id must match the scenario being updated', {
      fields: { id: [`Must be “${key}”`] },
    })
  }
  const { row } = await ctx.dataSource.transaction((m) =>
    storeScenarioVersion(m, document, user.id, 'existing'),
  )
  return presentScenarioDetail(row)
}

export async function listScenarioVersions(ctx: AppContext, key: string): Promise<ScenarioSummary[]> {
  const rows = await ctx.dataSource
    .getRepository(ScenarioEntity)
    .find({ where: { key }, order: { version: 'DESC' } })
  if (rows.length === 0) throw notFound('Scenario')
  return rows.map(presentScenario)
}

export async function getScenarioVersion(
  ctx: AppContext,
  key: string,
  version: number,
): Promise<ScenarioDetail> {
  const row = await ctx.dataSource.getRepository(ScenarioEntity).findOneBy({ key, version })
  if (!row) throw notFound('Scenario version')
  return presentScenarioDetail(row)
}

/** One exact version by its id, as assignments and attempts refer to it. */
export async function getScenarioVersionById(ctx: AppContext, id: string): Promise<ScenarioDetail> {
  const row = await ctx.dataSource.getRepository(ScenarioEntity).findOneBy({ id })
  if (!row) throw notFound('Scenario version')
  return presentScenarioDetail(row)
}

/** Version 1 of a new key, from the latest version of another. */
export async function duplicateScenario(
  ctx: AppContext,
  user: UserRow,
  key: string,
  { newKey, title }: DuplicateScenarioRequest,
): Promise<ScenarioDetail> {
  const source = await latestOrThrow(ctx, key)
  const document = { ...(JSON.parse(source.document) as Scenario), id: newKey, version: 1 }
  if (title) document.title = title
  else document.title = `${document.title} (copy)`.slice(0, 120)
  const { row } = await ctx.dataSource.transaction((m) => storeScenarioVersion(m, document, user.id, 'new'))
  return presentScenarioDetail(row)
}

/** Retires or restores every version of a key; answers with the latest. */
export async function setScenarioStatus(
  ctx: AppContext,
  key: string,
  status: ScenarioStatus,
): Promise<ScenarioSummary> {
  await latestOrThrow(ctx, key)
  await ctx.dataSource.getRepository(ScenarioEntity).update({ key }, { status })
  return presentScenario(await latestOrThrow(ctx, key))
}
