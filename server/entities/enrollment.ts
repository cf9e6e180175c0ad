import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { timestamp, uuidColumn, uuidPrimary, belongsTo } from './columns'

export interface EnrollmentRow {
  id: string
  cohortId: string
  userId: string
  createdAt: string
}

export const EnrollmentEntity = new EntitySchema<EnrollmentRow>({
  name: 'Enrollment',
  tableName: 'enrollments',
  columns: { id: uuidPrimary, cohortId: uuidColumn, userId: uuidColumn, createdAt: timestamp },
  uniques: [{ name: 'uq_enrollments_cohort_user', columns: ['cohortId', 'userId'] }],
  relations: {
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE'),
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<EnrollmentRow>['relations'],
})
