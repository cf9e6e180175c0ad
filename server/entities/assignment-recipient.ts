// One apprentice an assignment is set for, when it is set for selected apprentices only.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { timestamp, uuidColumn, uuidPrimary, belongsTo } from './columns'

export interface AssignmentRecipientRow {
  id: string
  assignmentId: string
  userId: string
  createdAt: string
}

export const AssignmentRecipientEntity = new EntitySchema<AssignmentRecipientRow>({
  name: 'AssignmentRecipient',
  tableName: 'assignment_recipients',
  columns: { id: uuidPrimary, assignmentId: uuidColumn, userId: uuidColumn, createdAt: timestamp },
  uniques: [{ name: 'uq_assignment_recipients_pair', columns: ['assignmentId', 'userId'] }],
  relations: {
    assignment: belongsTo('Assignment', 'assignmentId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<AssignmentRecipientRow>['relations'],
})
