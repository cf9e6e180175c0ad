import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { bool, text, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface CohortRow {
  id: string
  name: string
  description: string
  ownerId: string
  archived: boolean
  createdAt: string
  /**
   * Bumped by database triggers when anything in the cohort's gradebook changes; never written by code.
   * Its default makes TypeORM re-read inserted rows on SQLite and merge them back by position, which mixes
   * rows up in a multi-row insert: insert several cohorts with the query builder's updateEntity(false).
   */
  gradebookRevision?: number
  /** JSON array of the scenario keys open for free practice; null: every scenario. */
  practiceKeys?: string | null
}

export const CohortEntity = new EntitySchema<CohortRow>({
  name: 'Cohort',
  tableName: 'cohorts',
  columns: {
    id: uuidPrimary,
    name: varchar(120),
    description: text,
    ownerId: uuidColumn,
    archived: bool,
    createdAt: timestamp,
    gradebookRevision: { type: 'integer', default: 0, insert: false, update: false },
    practiceKeys: { type: 'text', nullable: true },
  },
  relations: {
    owner: belongsTo('User', 'ownerId', 'RESTRICT'),
  } as EntitySchemaOptions<CohortRow>['relations'],
})
