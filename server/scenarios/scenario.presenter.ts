// A stored scenario version → the API's summary (lists) or detail (with its document).
import type { ScenarioDetail, ScenarioLibraryItem, ScenarioSummary } from '@shared/api/scenarios'
import { referenceResultSchema, type ScenarioVersionWithReference } from '@shared/api/scenarioAuthoring'
import type { ScenarioRow } from '../entities'

export function presentScenario(row: ScenarioRow): ScenarioSummary {
  const document = JSON.parse(row.document) as {
    story?: string
    difficulty?: string
    estimatedMinutes?: number
  }
  return {
    id: row.id,
    key: row.key,
    version: row.version,
    title: row.title,
    story: document.story ?? '',
    difficulty: document.difficulty ?? 'introductory',
    estimatedMinutes: document.estimatedMinutes ?? 0,
    status: row.status,
    createdById: row.createdById,
    createdAt: row.createdAt,
  }
}

export const presentScenarioDetail = (row: ScenarioRow): ScenarioDetail => ({
  ...presentScenario(row),
  document: JSON.parse(row.document),
})

/** `firstVersion`: version 1 of the same key; the importer stores shipped scenarios with no author. */
export function presentLibraryItem(row: ScenarioRow, firstVersion: ScenarioRow): ScenarioLibraryItem {
  const document = JSON.parse(row.document) as { learningOutcomes?: string[] }
  return {
    ...presentScenario(row),
    origin: firstVersion.createdById === null ? 'shipped' : 'centre',
    learningOutcomes: document.learningOutcomes ?? [],
  }
}

/** A version in the version list, with how the key's reference solution fared on it (null before #17). */
export function presentVersionWithReference(row: ScenarioRow): ScenarioVersionWithReference {
  const stored = row.referenceResult ? referenceResultSchema.safeParse(JSON.parse(row.referenceResult)) : null
  return { ...presentScenario(row), reference: stored?.success ? stored.data : null }
}
