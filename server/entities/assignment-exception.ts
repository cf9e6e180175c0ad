// An instructor's exception for one apprentice on one assignment: their own due date, extra attempts,
// or excused from it.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  bool,
  integer,
  nullableTimestamp,
  text,
  timestamp,
  uuidColumn,
  uuidPrimary,
  belongsTo,
} from './columns'

export interface AssignmentExceptionRow {
  id: string
  assignmentId: string
  userId: string
  /** Their due date; null keeps the assignment's. */
  dueAt: string | null
  extraAttempts: number
  excused: boolean
  reason: string
  createdById: string
  updatedAt: string
}

export const AssignmentExceptionEntity = new EntitySchema<AssignmentExceptionRow>({
  name: 'AssignmentException',
  tableName: 'assignment_exceptions',
  columns: {
    id: uuidPrimary,
    assignmentId: uuidColumn,
    userId: uuidColumn,
    dueAt: nullableTimestamp,
    extraAttempts: integer,
    excused: bool,
    reason: text,
    createdById: uuidColumn,
    updatedAt: timestamp,
  },
  uniques: [{ name: 'uq_assignment_exceptions_pair', columns: ['assignmentId', 'userId'] }],
  relations: {
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
    createdBy: belongsTo('User', 'createdById', 'CASCADE'),
  } as EntitySchemaOptions<AssignmentExceptionRow>['relations'],
})
