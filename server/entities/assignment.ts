import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import type { ScorePolicy } from '@shared/api/assignments'
import type { LatePolicy } from '@shared/progress'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import { bool, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface AssignmentRow {
  id: string
  cohortId: string
  scenarioId: string
  title: string
  opensAt: string
  dueAt: string
  attemptLimit: number | null
  /** Kept in step with the level (false exactly for an assessment) for readers of the older column. */
  hintsAllowed: boolean
  /** Migration 1765700000000; an assignment made before it without hints became an assessment. */
  assistanceLevel: AssistanceLevel
  /** Which score a learning platform receives (migration 1765000000000); 'best' unless chosen. */
  scorePolicy: ScorePolicy
  createdById: string
  createdAt: string
  /** Null on assignments set before late policies existed: they accept late work without penalty. */
  latePolicy: LatePolicy | null
  /** Points off a late attempt's score (null: none). */
  latePenalty: number | null
  /** `selected`: only the apprentices in assignment_recipients; null or `cohort`: every member. */
  audience: 'cohort' | 'selected' | null
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
    assistanceLevel: { type: 'varchar', length: 16, default: 'standard' },
    scorePolicy: { type: 'varchar', length: 8, default: 'best' },
    createdById: uuidColumn,
    createdAt: timestamp,
    latePolicy: varchar(16, true),
    latePenalty: { type: 'integer', nullable: true },
    audience: varchar(16, true),
  },
  relations: {
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    scenario: belongsTo('Scenario', 'scenarioId', 'RESTRICT'),
    createdBy: belongsTo('User', 'createdById', 'RESTRICT'),
  } as EntitySchemaOptions<AssignmentRow>['relations'],
})
