// A refresh token is stored only as a hash; tokens rotated from one sign-in share a family for reuse detection.
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  nullableTimestamp,
  nullableUuid,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
  belongsTo,
} from './columns'

export interface RefreshTokenRow {
  id: string
  userId: string
  familyId: string
  tokenHash: string
  expiresAt: string
  createdAt: string
  revokedAt: string | null
  replacedById: string | null
}

export const RefreshTokenEntity = new EntitySchema<RefreshTokenRow>({
  name: 'RefreshToken',
  tableName: 'refresh_tokens',
  columns: {
    id: uuidPrimary,
    userId: uuidColumn,
    familyId: uuidColumn,
    tokenHash: { ...varchar(64), unique: true },
    expiresAt: timestamp,
    createdAt: timestamp,
    revokedAt: nullableTimestamp,
    replacedById: nullableUuid,
  },
  indices: [{ name: 'idx_refresh_tokens_family', columns: ['familyId'] }],
  relations: {
    user: belongsTo('User', 'userId', 'CASCADE'),
  } as EntitySchemaOptions<RefreshTokenRow>['relations'],
})
