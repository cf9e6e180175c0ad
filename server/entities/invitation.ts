import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import type { Role } from '@shared/api/auth'
import {
  nullableTimestamp,
  nullableUuid,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
  belongsTo,
} from './columns'

export interface InvitationRow {
  id: string
  email: string
  name: string
  role: Role
  cohortId: string | null
  invitedById: string
  tokenHash: string
  expiresAt: string
  acceptedAt: string | null
  createdAt: string
}

export const InvitationEntity = new EntitySchema<InvitationRow>({
  name: 'Invitation',
  tableName: 'invitations',
  columns: {
    id: uuidPrimary,
    email: varchar(254),
    name: varchar(120),
    role: varchar(16),
    cohortId: nullableUuid,
    invitedById: uuidColumn,
    tokenHash: { ...varchar(64), unique: true },
    expiresAt: timestamp,
    acceptedAt: nullableTimestamp,
    createdAt: timestamp,
  },
  relations: {
    cohort: belongsTo('Cohort', 'cohortId', 'CASCADE', true),
    invitedBy: belongsTo('User', 'invitedById', 'RESTRICT'),
  } as EntitySchemaOptions<InvitationRow>['relations'],
})
