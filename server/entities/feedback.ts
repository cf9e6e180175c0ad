import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { text, timestamp, uuidColumn, uuidPrimary, belongsTo } from './columns'

export interface FeedbackRow {
  id: string
  attemptId: string
  authorId: string
  body: string
  createdAt: string
}

export const FeedbackEntity = new EntitySchema<FeedbackRow>({
  name: 'Feedback',
  tableName: 'feedback',
  columns: { id: uuidPrimary, attemptId: uuidColumn, authorId: uuidColumn, body: text, createdAt: timestamp },
  relations: {
    attempt: belongsTo('Attempt', 'attemptId', 'CASCADE'),
    author: belongsTo('User', 'authorId', 'RESTRICT'),
  } as EntitySchemaOptions<FeedbackRow>['relations'],
})
