// Column shapes reused by every entity, chosen to mean the same on SQLite and PostgreSQL.
import type { EntitySchemaColumnOptions } from 'typeorm'

export const uuidPrimary: EntitySchemaColumnOptions = { type: 'varchar', length: 36, primary: true }
export const uuidColumn: EntitySchemaColumnOptions = { type: 'varchar', length: 36 }
export const nullableUuid: EntitySchemaColumnOptions = { type: 'varchar', length: 36, nullable: true }
/** Timestamps are ISO 8601 UTC text (`toISOString()`), which sorts correctly as text. */
export const timestamp: EntitySchemaColumnOptions = { type: 'varchar', length: 32 }
export const nullableTimestamp: EntitySchemaColumnOptions = { type: 'varchar', length: 32, nullable: true }
export const text: EntitySchemaColumnOptions = { type: 'text' }
export const nullableText: EntitySchemaColumnOptions = { type: 'text', nullable: true }
export const bool: EntitySchemaColumnOptions = { type: 'boolean' }
export const nullableBool: EntitySchemaColumnOptions = { type: 'boolean', nullable: true }
export const integer: EntitySchemaColumnOptions = { type: 'integer' }
export const nullableReal: EntitySchemaColumnOptions = { type: 'real', nullable: true }
export const varchar = (length: number, nullable = false): EntitySchemaColumnOptions => ({
  type: 'varchar',
  length,
  nullable,
})

type OnDelete = 'CASCADE' | 'RESTRICT' | 'SET NULL'

/**
 * A foreign key on an existing id column, declared so the entities describe the same schema as the
 * migrations (the relation is never loaded; code reads the id column).
 */
export const belongsTo = (
  target: string,
  column: string,
  onDelete: OnDelete = 'RESTRICT',
  nullable = false,
) => ({
  type: 'many-to-one' as const,
  target,
  joinColumn: { name: column },
  onDelete,
  nullable,
  createForeignKeyConstraints: true,
})
