import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import type { ScorePolicy } from '@shared/api/assignments'
import { bool, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface AssignmentRow {
  id: string
  cohortId: string
  scenarioId: string
  title: string
  opensAt: string
  dueAt: string
  attemptLimit: number | null
  hintsAllowed: boolean
  /** Which score a learning platform receives (migration 1765000000000); 'best' unless chosen. */
  scorePolicy: ScorePolicy
  createdById: string
  createdAt: string
}

export const AssignmentEntity = new EntitySchema<AssignmentRow>({
  name: 'Assignment',
  tableName: 'assignments',
  columns: {
    id: uuidPrimary,
    cohortId: uuidColumn,
    scenarioId: uuidColumn,
    title: varchar(160),
    opensAt: timestamp,
    dueAt: timestamp,
    attemptLimit: { type: 'integer', nullable: true },
    hintsAllowed: bool,
    scorePolicy: { type: 'varchar', length: 8, default: 'best' },
    createdById: uuidColumn,
    createdAt: timestamp,
  },
  relations: {
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    scenario: belongsTo('Scenario', 'scenarioId', 'RESTRICT'),
    createdBy: belongsTo('User', 'createdById', 'RESTRICT'),
  } as EntitySchemaOptions<AssignmentRow>['relations'],
})
