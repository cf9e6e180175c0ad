// A co-instructor of a cohort: manages it as its owner does (but cannot change who teaches it).
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { timestamp, uuidColumn, uuidPrimary, belongsTo } from './columns'

export interface CohortInstructorRow {
  id: string
  cohortId: string
  userId: string
  createdAt: string
}

export const CohortInstructorEntity = new EntitySchema<CohortInstructorRow>({
  name: 'CohortInstructor',
  tableName: 'cohort_instructors',
  columns: { id: uuidPrimary, cohortId: uuidColumn, userId: uuidColumn, createdAt: timestamp },
  uniques: [{ name: 'uq_cohort_instructors_pair', columns: ['cohortId', 'userId'] }],
  indices: [{ name: 'idx_cohort_instructors_user', columns: ['userId'] }],
  relations: {
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<CohortInstructorRow>['relations'],
})
