import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import { nullableTimestamp, timestamp, uuidColumn, uuidPrimary, varchar, belongsTo } from './columns'

export interface PasswordResetRow {
  id: string
  userId: string
  tokenHash: string
  expiresAt: string
  usedAt: string | null
  createdAt: string
}

export const PasswordResetEntity = new EntitySchema<PasswordResetRow>({
  name: 'PasswordReset',
  tableName: 'password_resets',
  columns: {
    id: uuidPrimary,
    userId: uuidColumn,
    tokenHash: { ...varchar(64), unique: true },
    expiresAt: timestamp,
    usedAt: nullableTimestamp,
    createdAt: timestamp,
  },
  relations: {
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<PasswordResetRow>['relations'],
})
