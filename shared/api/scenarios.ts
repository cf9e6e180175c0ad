// Scenarios: versioned exercise documents in the shared scenario format (shared/scenario/schema.ts).
import { z } from 'zod'
import { scenarioSchema } from '../scenario/schema'
import { idSchema, isoDateTimeSchema } from './common'

export const scenarioKeySchema = z
  .string()
  .trim()
  .min(2)
  .max(80)
  .regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, { error: 'Use lower-case letters, digits and single hyphens' })

export const scenarioStatusSchema = z.enum(['active', 'retired'])
export type ScenarioStatus = z.infer<typeof scenarioStatusSchema>

/**
 * One stored version. `id` names this exact version (assignments and attempts point at it);
 * `key` is the document's own `id` slug, stable across versions. The server numbers versions and
 * writes that number into the stored document's `version`.
 */
export const scenarioSummarySchema = z.object({
  id: idSchema,
  key: z.string(),
  version: z.number().int().min(1),
  title: z.string(),
  story: z.string(),
  difficulty: z.string(),
  estimatedMinutes: z.number().int(),
  status: scenarioStatusSchema,
  createdById: idSchema.nullable(),
  createdAt: isoDateTimeSchema,
})
export type ScenarioSummary = z.infer<typeof scenarioSummarySchema>

export const scenarioDocumentSchema = scenarioSchema
export type ScenarioDocument = z.infer<typeof scenarioDocumentSchema>

export const scenarioDetailSchema = scenarioSummarySchema.extend({ document: scenarioDocumentSchema })
export type ScenarioDetail = z.infer<typeof scenarioDetailSchema>

export const scenarioListQuerySchema = z.object({
  includeRetired: z
    .enum(['true', 'false'])
    .transform((value) => value === 'true')
    .default(false),
})
export type ScenarioListQuery = z.input<typeof scenarioListQuerySchema>
/** Shipped with Slipway (version 1 came from scenarios/*.json) or written at this centre. */
export const scenarioOriginSchema = z.enum(['shipped', 'centre'])
export type ScenarioOrigin = z.infer<typeof scenarioOriginSchema>
/** A library entry: the summary plus what the library filters by. */
export const scenarioLibraryItemSchema = scenarioSummarySchema.extend({
  origin: scenarioOriginSchema,
  learningOutcomes: z.array(z.string()),
})
export type ScenarioLibraryItem = z.infer<typeof scenarioLibraryItemSchema>
/** The list shows the newest version of each key, ordered by title. */
export const scenarioListSchema = z.object({ items: z.array(scenarioLibraryItemSchema) })
export type ScenarioList = z.infer<typeof scenarioListSchema>
export const scenarioVersionListSchema = z.object({ items: z.array(scenarioSummarySchema) })

export const scenarioKeyParamsSchema = z.object({ key: scenarioKeySchema })
export const scenarioVersionParamsSchema = z.object({
  key: scenarioKeySchema,
  version: z.coerce.number().int().min(1),
})

/** Create: version 1 of a new key (the document's `id`). Update: the body is the next version's document. */
export const createScenarioRequestSchema = scenarioDocumentSchema
export type CreateScenarioRequest = z.input<typeof createScenarioRequestSchema>
export const updateScenarioRequestSchema = scenarioDocumentSchema
export type UpdateScenarioRequest = z.input<typeof updateScenarioRequestSchema>
export const duplicateScenarioRequestSchema = z.object({
  newKey: scenarioKeySchema,
  title: z.string().trim().min(3).max(120).optional(),
})
export type DuplicateScenarioRequest = z.infer<typeof duplicateScenarioRequestSchema>

/**
 * Upload of a scenario pack: multipart field `pack`, one `.json` file holding one scenario document
 * or an array of them. Each becomes a new key or the next version of an existing one; all or nothing.
 */
export const SCENARIO_PACK_FIELD = 'pack'
export const SCENARIO_PACK_MAX_BYTES = 512 * 1024
export const scenarioPackSchema = z.union([
  scenarioDocumentSchema,
  z.array(scenarioDocumentSchema).min(1).max(50),
])
export type ScenarioPack = z.infer<typeof scenarioPackSchema>
export const scenarioUploadResultSchema = z.object({
  items: z.array(z.object({ scenario: scenarioSummarySchema, created: z.boolean() })),
})
export type ScenarioUploadResult = z.infer<typeof scenarioUploadResultSchema>
