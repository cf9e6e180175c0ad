// Scenario packs (issue 17): export the newest version of some keys with their reference solutions; import a
// pack (or, as before, bare documents) with everything validated and every solution re-graded before anything
// is stored. All or nothing: one scenario with problems, or one solution short of full marks, refuses the pack.
import type { EntityManager } from 'typeorm'
import type { ZodType } from 'zod'
import {
  SCENARIO_PACK_FORMAT,
  SCENARIO_PACK_FORMAT_VERSION,
  scenarioPackFileSchema,
  type PackEntry,
  type PackImportItem,
  type ReferenceResult,
  type ScenarioPackFile,
} from '@shared/api/scenarioAuthoring'
import { SCENARIO_PACK_FIELD, SCENARIO_PACK_MAX_BYTES, scenarioPackSchema } from '@shared/api/scenarios'
import { referenceShortfall } from '@shared/scenario/reference'
import type { AppContext } from '../context'
import { ScenarioDraftEntity, ScenarioReferenceSolutionEntity, type UserRow } from '../entities'
import { HttpError } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { inTransactionWithUpload, uploadedText, type UploadKind } from '../infrastructure/storage/uploads'
import { replaceDraft } from './drafts.service'
import { checkScenarioDocument } from './scenario-check'
import { latestVersion, storeScenarioVersion } from './scenarios.service'

export const PACK_UPLOAD: UploadKind = {
  purpose: 'scenarioPack',
  field: SCENARIO_PACK_FIELD,
  maxBytes: SCENARIO_PACK_MAX_BYTES,
  extensions: ['.json'],
  mimeTypes: ['application/json', 'text/json', 'text/plain'],
  label: 'scenario pack',
}

/** The pack file of the newest version of each key, and its file name; 404 naming a key not found. */
export async function exportPack(
  ctx: AppContext,
  keys: string[],
): Promise<{ fileName: string; pack: ScenarioPackFile }> {
  const scenarios: PackEntry[] = []
  for (const key of [...new Set(keys)]) {
    const row = await latestVersion(ctx.dataSource, key)
    if (!row) throw new HttpError(404, 'not_found', `There is no scenario “${key}” to export`)
    const solution = await ctx.dataSource.getRepository(ScenarioReferenceSolutionEntity).findOneBy({ key })
    scenarios.push({
      document: JSON.parse(row.document),
      referenceSolution: solution ? { events: JSON.parse(solution.events) } : null,
    })
  }
  const exportedAt = nowIso()
  return {
    fileName: `slipway-scenarios-${exportedAt.slice(0, 10)}.json`,
    pack: {
      format: SCENARIO_PACK_FORMAT,
      formatVersion: SCENARIO_PACK_FORMAT_VERSION,
      exportedAt,
      scenarios,
    },
  }
}

/** A pack file, or bare documents (one or an array, without solutions) as packs were before #17. */
function packEntriesOf(json: unknown): { entries: PackEntry[]; prefix: (index: number) => string } {
  // Parse by the shape given, so an error names its place: `1.id` is the second scenario's id.
  const parse = <T>(schema: ZodType<T>) => schema.parse(json)
  if (json !== null && typeof json === 'object' && !Array.isArray(json) && 'format' in json)
    return { entries: parse(scenarioPackFileSchema).scenarios, prefix: (i) => `.scenarios[${i}].document` }
  if (Array.isArray(json))
    return {
      entries: parse(scenarioPackSchema.options[1]).map((document) => ({
        document,
        referenceSolution: null,
      })),
      prefix: (i) => `[${i}]`,
    }
  return {
    entries: [{ document: parse(scenarioPackSchema.options[0]), referenceSolution: null }],
    prefix: () => '',
  }
}

export async function importPack(
  ctx: AppContext,
  user: UserRow,
  upload: Express.Multer.File | undefined,
): Promise<PackImportItem[]> {
  const { file, text } = uploadedText({ file: upload }, PACK_UPLOAD)
  let json: unknown
  try {
    json = JSON.parse(text)
  } catch {
    throw new HttpError(415, 'unsupported_media_type', 'The scenario pack is not valid JSON')
  }
  const { entries, prefix } = packEntriesOf(json)
  // Every check and every grade before anything is stored.
  entries.forEach((entry, i) => checkScenarioDocument(entry.document, prefix(i)))
  const results: (ReferenceResult | null)[] = []
  for (const { document, referenceSolution } of entries) {
    if (!referenceSolution) {
      results.push(null)
      continue
    }
    const result = await ctx.grading.reference(
      JSON.stringify(document),
      JSON.stringify(referenceSolution.events),
    )
    const shortfall = referenceShortfall(result)
    if (shortfall)
      throw new HttpError(
        409,
        'reference_not_full',
        `“${document.title}”: ${shortfall} Nothing from the pack was kept.`,
      )
    results.push(result)
  }
  return inTransactionWithUpload(ctx, user.id, PACK_UPLOAD, file, async (manager) => {
    const items: PackImportItem[] = []
    for (const [i, { document, referenceSolution }] of entries.entries()) {
      const base = { key: document.id, title: document.title, reference: results[i]! }
      if (!referenceSolution) {
        const replaced = await hasDraft(manager, document.id)
        await replaceDraft(manager, document.id, document, user.id)
        const draftNote = replaced ? DRAFT_REPLACED : null
        items.push({ ...base, outcome: 'draft', version: null, scenarioId: null, draftNote })
        continue
      }
      await manager.getRepository(ScenarioReferenceSolutionEntity).save({
        key: document.id,
        events: JSON.stringify(referenceSolution.events),
        recordedAt: nowIso(),
        recordedById: user.id,
      })
      const { row, draftMoved } = await storeScenarioVersion(
        manager,
        document,
        user.id,
        'either',
        prefix(i),
        results[i],
      )
      const draftNote = draftMoved ? draftMovedOnto(row.version) : null
      items.push({ ...base, outcome: 'published', version: row.version, scenarioId: row.id, draftNote })
    }
    return items
  })
}

const hasDraft = (manager: EntityManager, key: string) =>
  manager.getRepository(ScenarioDraftEntity).existsBy({ key })

const DRAFT_REPLACED = 'It takes the place of the draft of this scenario that was in progress.'

/** The draft stays someone's work; it is not merged, so say what publishing it would now undo. */
const draftMovedOnto = (version: number) =>
  `A draft of this scenario was in progress; it is kept and now builds on version ${version}. ` +
  'Compare the two before publishing it: any changes this version brought are not in the draft.'
