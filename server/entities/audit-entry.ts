// The audit trail: who changed what, when, from which value to which, and why (values as JSON text).
import { EntitySchema, type EntitySchemaOptions } from 'typeorm'
import {
  nullableText,
  nullableUuid,
  text,
  timestamp,
  uuidColumn,
  uuidPrimary,
  varchar,
  belongsTo,
} from './columns'

export interface AuditEntryRow {
  id: string
  actorId: string | null
  action: string
  entityType: string
  entityId: string
  fromValue: string | null
  toValue: string
  reason: string
  createdAt: string
}

export const AuditEntryEntity = new EntitySchema<AuditEntryRow>({
  name: 'AuditEntry',
  tableName: 'audit_entries',
  columns: {
    id: uuidPrimary,
    actorId: nullableUuid,
    action: varchar(40),
    entityType: varchar(40),
    entityId: uuidColumn,
    fromValue: nullableText,
    toValue: text,
    reason: text,
    createdAt: timestamp,
  },
  indices: [{ name: 'idx_audit_entity', columns: ['entityType', 'entityId'] }],
  relations: {
    actor: belongsTo('User', 'actorId', 'SET NULL', true),
  } as EntitySchemaOptions<AuditEntryRow>['relations'],
})
