// Authoring (issue 17): the one working draft of a scenario key, and the key's reference solution (the
// author's recorded run that must score full marks before a version is published).
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { belongsTo, nullableText, nullableUuid, text, timestamp, varchar } from './columns'

export interface ScenarioDraftRow {
  key: string
  /** The working document as JSON text (it may still have problems). */
  document: string
  /** The version it was started from; null for a key never published. */
  baseVersion: number | null
  createdAt: string
  updatedAt: string
  updatedById: string | null
  /**
   * The key's reference solution graded on this document, kept so reading drafts does not grade again
   * (server/scenarios/reference-grade.ts): the result as JSON text, and a fingerprint of what was graded.
   * Null until first graded; a fingerprint that no longer matches means grade again. Publishing never reads it.
   */
  referenceFingerprint?: string | null
  referenceResult?: string | null
}

export const ScenarioDraftEntity = new EntitySchema<ScenarioDraftRow>({
  name: 'ScenarioDraft',
  tableName: 'scenario_drafts',
  columns: {
    key: { ...varchar(80), primary: true },
    document: text,
    baseVersion: { type: 'integer', nullable: true },
    createdAt: timestamp,
    updatedAt: timestamp,
    updatedById: nullableUuid,
    referenceFingerprint: varchar(64, true),
    referenceResult: nullableText,
  },
  relations: {
    updatedBy: belongsTo('User', 'updatedById', 'SET NULL', true),
  } as EntitySchemaOptions<ScenarioDraftRow>['relations'],
})

export interface ScenarioReferenceSolutionRow {
  key: string
  /** The event log as JSON text. */
  events: string
  recordedAt: string
  recordedById: string | null
}

export const ScenarioReferenceSolutionEntity = new EntitySchema<ScenarioReferenceSolutionRow>({
  name: 'ScenarioReferenceSolution',
  tableName: 'scenario_reference_solutions',
  columns: {
    key: { ...varchar(80), primary: true },
    events: text,
    recordedAt: timestamp,
    recordedById: nullableUuid,
  },
  relations: {
    recordedBy: belongsTo('User', 'recordedById', 'SET NULL', true),
  } as EntitySchemaOptions<ScenarioReferenceSolutionRow>['relations'],
})
