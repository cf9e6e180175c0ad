// An attempt is its event log plus the server's grade; `id` is the client-generated UUID.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import type { AttemptStatus } from '@shared/api/attempts'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import {
  bool,
  integer,
  nullableBool,
  nullableReal,
  nullableText,
  nullableTimestamp,
  nullableUuid,
  text,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
  belongsTo,
} from './columns'

export interface AttemptRow {
  id: string
  userId: string
  assignmentId: string | null
  scenarioId: string
  status: AttemptStatus
  /** The assistance level it was started at (migration 1765700000000); never changes afterwards. */
  assistanceLevel: AssistanceLevel
  /** JSON text of the event log. */
  events: string
  eventCount: number
  late: boolean
  startedAt: string
  updatedAt: string
  submittedAt: string | null
  autoScore: number | null
  autoPassed: boolean | null
  score: number | null
  passed: boolean | null
  /** JSON text of the grader's per-objective evidence. */
  evidence: string | null
  gradedAt: string | null
  /** When an instructor marked it reviewed (or left feedback, or changed the grade). */
  reviewedAt: string | null
  reviewedById: string | null
  /** The latest grade override: when, and the reason given (the full history is in audit_entries). */
  overriddenAt: string | null
  overrideReason: string | null
}

export const AttemptEntity = new EntitySchema<AttemptRow>({
  name: 'Attempt',
  tableName: 'attempts',
  columns: {
    id: uuidPrimary,
    userId: uuidColumn,
    assignmentId: nullableUuid,
    scenarioId: uuidColumn,
    status: varchar(16),
    assistanceLevel: { type: 'varchar', length: 16, default: 'standard' },
    events: text,
    eventCount: integer,
    late: bool,
    startedAt: timestamp,
    updatedAt: timestamp,
    submittedAt: nullableTimestamp,
    autoScore: nullableReal,
    autoPassed: nullableBool,
    score: nullableReal,
    passed: nullableBool,
    evidence: nullableText,
    gradedAt: nullableTimestamp,
    reviewedAt: nullableTimestamp,
    reviewedById: nullableUuid,
    overriddenAt: nullableTimestamp,
    overrideReason: nullableText,
  },
  indices: [
    { name: 'idx_attempts_user', columns: ['userId'] },
    { name: 'idx_attempts_assignment', columns: ['assignmentId'] },
    // Covers the gradebook's summary query (migrations 1764800000000, 1765000000000); keep the column order in step.
    {
      name: 'idx_attempts_gradebook',
      columns: [
        'assignmentId',
        'userId',
        'status',
        'score',
        'passed',
        'updatedAt',
        'submittedAt',
        'late',
        'id',
      ],
    },
  ],
  relations: {
    user: belongsTo('User', 'userId', 'CASCADE'),
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE', true),
    scenario: belongsTo('Scenario', 'scenarioId', 'RESTRICT'),
  } as EntitySchemaOptions<AttemptRow>['relations'],
})
