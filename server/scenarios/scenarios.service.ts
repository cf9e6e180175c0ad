// Scenarios and their versions: a new key starts at version 1; each publish is the next version, never an
// edit. Everyone signed in reads; staff retire and restore. Drafts and publishing: drafts.service.ts;
// packs: packs.service.ts.
import { randomUUID } from 'node:crypto'
import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { DataSource, EntityManager } from 'typeorm'
import { z } from 'zod'
import {
  type ScenarioDetail,
  type ScenarioLibraryItem,
  type ScenarioStatus,
  type ScenarioSummary,
  type scenarioListQuerySchema,
} from '@shared/api/scenarios'
import type { ReferenceResult, ScenarioVersionWithReference } from '@shared/api/scenarioAuthoring'
import { attemptLogSchema, type AttemptEvent } from '@shared/model/events'
import { referenceResult } from '@shared/scenario/reference'
import { scenarioSchema, type Scenario } from '@shared/scenario/schema'
import type { AppContext } from '../context'
import {
  ScenarioDraftEntity,
  ScenarioEntity,
  ScenarioReferenceSolutionEntity,
  type ScenarioRow,
  type UserRow,
} from '../entities'
import { HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import {
  presentLibraryItem,
  presentScenario,
  presentScenarioDetail,
  presentVersionWithReference,
} from './scenario.presenter'
import { checkScenarioDocument } from './scenario-check'

/** Beside the shipped scenarios: `<key>.json` holds `{ events }`, the key's reference solution. */
export const REFERENCE_SOLUTIONS_FOLDER = 'reference-solutions'
const referenceSolutionFileSchema = z.object({ events: attemptLogSchema })

type ScenarioListQuery = z.output<typeof scenarioListQuerySchema>

export async function latestVersion(
  manager: EntityManager | DataSource,
  key: string,
): Promise<ScenarioRow | null> {
  return manager.getRepository(ScenarioEntity).findOne({ where: { key }, order: { version: 'DESC' } })
}

/**
 * Validates the document's meaning (beyond its shape) and stores it as the next version of its key. A draft
 * of the key in progress is kept and moved onto the new version (`draftMoved`): it is then compared with,
 * and publishes after, the version that is now the newest.
 */
export async function storeScenarioVersion(
  manager: EntityManager,
  document: Scenario,
  createdById: string | null,
  expect: 'new' | 'existing' | 'either',
  problemPathPrefix = '',
  referenceResult: ReferenceResult | null = null,
): Promise<{ row: ScenarioRow; created: boolean; draftMoved: boolean }> {
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
    referenceResult: referenceResult ? JSON.stringify(referenceResult) : null,
  }
  await manager.getRepository(ScenarioEntity).insert(row)
  return { row, created: !previous, draftMoved: await moveDraftOnto(manager, document.id, version) }
}

/** The key's draft, if any, now builds on `version`: its base and the number its document carries move on. */
async function moveDraftOnto(manager: EntityManager, key: string, version: number): Promise<boolean> {
  const drafts = manager.getRepository(ScenarioDraftEntity)
  const draft = await drafts.findOneBy({ key })
  if (!draft) return false
  const document = { ...JSON.parse(draft.document), version: version + 1 }
  await drafts.update({ key }, { baseVersion: version, document: JSON.stringify(document) })
  return true
}

/**
 * The scenarios shipped in scenarios/*.json; each key missing from the database is added as version 1.
 * scenarios/reference-solutions/<key>.json is the key's reference solution (npm run fixtures:build writes
 * it), stored when the key has none so a shipped scenario can be edited and published without recording
 * one; version 1 keeps how it fared. A file that fails its checks is skipped and reported, so one bad file
 * cannot stop the server.
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
      const solution = shippedReferenceSolution(dir, document.id)
      await dataSource.transaction(async (manager) => {
        const solutions = manager.getRepository(ScenarioReferenceSolutionEntity)
        const existing = await latestVersion(manager, document.id)
        const storeSolution = solution && !(await solutions.existsBy({ key: document.id }))
        if (storeSolution)
          await solutions.insert({
            key: document.id,
            events: JSON.stringify(solution),
            recordedAt: nowIso(),
            recordedById: null,
          })
        if (existing) return
        // Graded on this thread: start-up, before any request is served.
        const result = solution ? referenceResult(document, solution) : null
        await storeScenarioVersion(manager, document, null, 'new', '', result)
        added++
      })
    } catch (error) {
      const details = error instanceof HttpError ? JSON.stringify(error.details) : ''
      skipped.push({ file, problem: `${(error as Error).message} ${details}`.trim() })
    }
  }
  return { added, skipped }
}

/** The shipped reference solution of a key, or null when there is none. */
export function shippedReferenceSolution(dir: string, key: string): AttemptEvent[] | null {
  const file = join(dir, REFERENCE_SOLUTIONS_FOLDER, `${key}.json`)
  if (!existsSync(file)) return null
  return referenceSolutionFileSchema.parse(JSON.parse(readFileSync(file, 'utf8'))).events
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

export async function getLatestScenario(
  ctx: AppContext,
  user: UserRow,
  key: string,
): Promise<ScenarioDetail> {
  const row = await latestOrThrow(ctx, key)
  if (row.status === 'retired' && user.role === 'apprentice') throw notFound('Scenario')
  return presentScenarioDetail(row)
}

export async function listScenarioVersions(
  ctx: AppContext,
  key: string,
): Promise<ScenarioVersionWithReference[]> {
  const rows = await ctx.dataSource
    .getRepository(ScenarioEntity)
    .find({ where: { key }, order: { version: 'DESC' } })
  if (rows.length === 0) throw notFound('Scenario')
  return rows.map(presentVersionWithReference)
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
