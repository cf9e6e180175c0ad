// Scenario authoring: drafts, reference solutions, the publish gate and packs (issue #17).
//
// The life of a scenario key:
// - A draft is the author's working copy: one per key, saved whole on every "Save draft", kept even
//   while it still has problems (the problems are computed on read and shown in words).
// - "Try it" opens the draft on the panel as an apprentice would; nothing is stored or counted.
// - "Record the reference solution" stores one run (an event log) against the key. It is graded
//   against the draft as it is now: the grade is kept with a fingerprint of the document and the run,
//   and graded again when either changes (reading a list of drafts grades nothing unchanged).
// - "Publish" turns the draft into the key's next version only when the draft passes every check and
//   the reference solution scores full marks on it (graded afresh, never the kept grade); the draft is
//   then gone. The version keeps the result of its reference solution (every later version is re-graded
//   against it at publish).
// - A new version published another way (a pack) while a draft is in progress keeps the draft and
//   moves it onto that version: "Draft of version N" and its comparison then name the newest version.
// - Attempts and assignments keep pointing at the exact version they were made on.
import { z } from 'zod'
import { attemptLogSchema } from '../model/events'
import { idSchema, isoDateTimeSchema } from './common'
import { scenarioKeySchema, scenarioSummarySchema } from './scenarios'
import { scenarioSchema } from '../scenario/schema'

/** The largest draft document the server keeps (a shipped scenario is about 10 KB). */
export const SCENARIO_DRAFT_MAX_BYTES = 256 * 1024

/**
 * A draft's document: the scenario format, possibly incomplete or wrong (it is a working copy). The
 * server only insists on a JSON object; its `id` is always the draft's key and `version` the next one.
 */
export const scenarioDraftDocumentSchema = z.record(z.string(), z.unknown())
export type ScenarioDraftDocument = z.infer<typeof scenarioDraftDocumentSchema>

/** One problem with a draft, in words (`place` as problemWords.ts words it, never a JSON path). */
export const draftProblemSchema = z.object({
  /** The JSON path, for the editor to find the field; never shown. */
  path: z.string(),
  place: z.string(),
  message: z.string(),
})
export type DraftProblem = z.infer<typeof draftProblemSchema>

/** How the reference solution fares against one document (the draft, or a published version). */
export const referenceResultSchema = z.object({
  /** 0–100. */
  score: z.number().min(0).max(100),
  passed: z.boolean(),
  /** Every point earned, no hint cost, no safety violation: what publishing needs. */
  fullMarks: z.boolean(),
  pointsEarned: z.number().min(0),
  pointsPossible: z.number().min(0),
  /** Titles of the objectives it does not meet (words for the author). */
  missed: z.array(z.string()),
  safetyViolations: z.number().int().min(0),
  /** Set when the log cannot be replayed on this document (a device it uses was removed …). */
  problem: z.string().optional(),
})
export type ReferenceResult = z.infer<typeof referenceResultSchema>

export const referenceSolutionSummarySchema = z.object({
  recordedAt: isoDateTimeSchema,
  recordedByName: z.string().nullable(),
  /** How many actions the run has. */
  actions: z.number().int().min(0),
  /** Simulated length of the run, ms. */
  durationMs: z.number().min(0),
  /** Graded against the draft as it is now; null while the draft does not pass its checks. */
  result: referenceResultSchema.nullable(),
})
export type ReferenceSolutionSummary = z.infer<typeof referenceSolutionSummarySchema>

export const scenarioDraftSchema = z.object({
  key: scenarioKeySchema,
  /** The document's title as typed so far ('' when none). */
  title: z.string(),
  document: scenarioDraftDocumentSchema,
  /** The version this draft was started from; null for a key never published. */
  baseVersion: z.number().int().min(1).nullable(),
  /** The number publishing would give it. */
  nextVersion: z.number().int().min(1),
  createdAt: isoDateTimeSchema,
  updatedAt: isoDateTimeSchema,
  updatedByName: z.string().nullable(),
  /** Empty when the draft passes every check. */
  problems: z.array(draftProblemSchema),
  reference: referenceSolutionSummarySchema.nullable(),
  /** Whether "Publish" would succeed now (no problems and a reference solution with full marks). */
  publishable: z.boolean(),
})
export type ScenarioDraft = z.infer<typeof scenarioDraftSchema>

export const scenarioDraftSummarySchema = scenarioDraftSchema.pick({
  key: true,
  title: true,
  baseVersion: true,
  nextVersion: true,
  updatedAt: true,
  updatedByName: true,
  publishable: true,
})
export type ScenarioDraftSummary = z.infer<typeof scenarioDraftSummarySchema>
export const scenarioDraftListSchema = z.object({ items: z.array(scenarioDraftSummarySchema) })

/** POST /api/scenarios/drafts: a draft of a brand-new key (409 conflict when the key is taken). */
export const createDraftRequestSchema = z.object({
  key: scenarioKeySchema,
  document: scenarioDraftDocumentSchema,
})
export type CreateDraftRequest = z.infer<typeof createDraftRequestSchema>

/** PUT /api/scenarios/:key/draft: the whole working copy (creates the draft when there is none). */
export const saveDraftRequestSchema = z.object({ document: scenarioDraftDocumentSchema })
export type SaveDraftRequest = z.infer<typeof saveDraftRequestSchema>

/** PUT /api/scenarios/:key/draft/reference: the run recorded on the panel against the draft. */
export const recordReferenceRequestSchema = z.object({ events: attemptLogSchema })
export type RecordReferenceRequest = z.input<typeof recordReferenceRequestSchema>

/** A published version with how its reference solution fared on it (null: published before #17). */
export const scenarioVersionWithReferenceSchema = scenarioSummarySchema.extend({
  reference: referenceResultSchema.nullable(),
})
export type ScenarioVersionWithReference = z.infer<typeof scenarioVersionWithReferenceSchema>

// ---- Packs --------------------------------------------------------------------------------------

export const SCENARIO_PACK_FORMAT = 'slipway-scenario-pack'
export const SCENARIO_PACK_FORMAT_VERSION = 1

/** One scenario in a pack: its newest published document and its reference solution. */
export const packEntrySchema = z.object({
  document: scenarioSchema,
  referenceSolution: z.object({ events: attemptLogSchema }).nullable(),
})
export type PackEntry = z.infer<typeof packEntrySchema>

/**
 * GET /api/scenarios/export?keys=a,b (staff) downloads this as a .json file; POST /api/scenarios/upload
 * takes it (or, as before, one bare scenario document or an array of them, which have no solutions).
 */
export const scenarioPackFileSchema = z.object({
  format: z.literal(SCENARIO_PACK_FORMAT),
  formatVersion: z.literal(SCENARIO_PACK_FORMAT_VERSION),
  exportedAt: isoDateTimeSchema,
  scenarios: z.array(packEntrySchema).min(1).max(50),
})
export type ScenarioPackFile = z.infer<typeof scenarioPackFileSchema>

export const exportPackQuerySchema = z.object({
  keys: z
    .string()
    .transform((text) =>
      text
        .split(',')
        .map((k) => k.trim())
        .filter(Boolean),
    )
    .pipe(z.array(scenarioKeySchema).min(1).max(50)),
})

/**
 * What became of each uploaded scenario. A scenario whose solution scores full marks on it is
 * published as the key's next version; one without a solution is kept as a draft (record a solution,
 * then publish). A solution that does not score full marks refuses the whole pack (409, nothing kept).
 * A draft of the key already in progress is kept when the pack publishes (it now builds on the new
 * version) and replaced when the pack brings a draft; `draftNote` says which, in words.
 */
export const packImportItemSchema = z.object({
  key: scenarioKeySchema,
  title: z.string(),
  outcome: z.enum(['published', 'draft']),
  /** The published version (outcome published). */
  version: z.number().int().min(1).nullable(),
  /** The version's id (outcome published). */
  scenarioId: idSchema.nullable(),
  reference: referenceResultSchema.nullable(),
  /** What became of a draft of this key that was in progress, in words; null when there was none. */
  draftNote: z.string().nullable(),
})
export type PackImportItem = z.infer<typeof packImportItemSchema>
export const packImportResultSchema = z.object({ items: z.array(packImportItemSchema) })
export type PackImportResult = z.infer<typeof packImportResultSchema>
