// One stored version of a scenario; (key, version) is unique and a version is never edited.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  integer,
  nullableText,
  nullableUuid,
  text,
  timestamp,
  uuidPrimary,
  varchar,
  belongsTo,
} from './columns'

export interface ScenarioRow {
  id: string
  key: string
  version: number
  title: string
  status: 'active' | 'retired'
  /** The scenario document as JSON text. */
  document: string
  createdById: string | null
  createdAt: string
  /** How the key's reference solution fared on this version (ReferenceResult JSON); null before #17. */
  referenceResult?: string | null
}

export const ScenarioEntity = new EntitySchema<ScenarioRow>({
  name: 'Scenario',
  tableName: 'scenarios',
  columns: {
    id: uuidPrimary,
    key: varchar(80),
    version: integer,
    title: varchar(160),
    status: varchar(16),
    document: text,
    createdById: nullableUuid,
    createdAt: timestamp,
    referenceResult: nullableText,
  },
  uniques: [{ name: 'uq_scenarios_key_version', columns: ['key', 'version'] }],
  relations: {
    createdBy: belongsTo('User', 'createdById', 'SET NULL', true),
  } as EntitySchemaOptions<ScenarioRow>['relations'],
})
