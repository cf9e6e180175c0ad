// Storing scenario versions: a new key starts at version 1; an update is the next version, never an edit.
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { DataSource, EntityManager } from 'typeorm'
import { scenarioSchema, type Scenario } from '@shared/scenario/schema'
import { ScenarioEntity, type ScenarioRow } from '../entities'
import { HttpError } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { checkScenarioDocument } from './scenario-check'

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
