// The first schema, written with TypeORM's Table API so the same migration runs on SQLite and PostgreSQL.
import {
  Table,
  TableForeignKey,
  TableIndex,
  TableUnique,
  type MigrationInterface,
  type QueryRunner,
  type TableColumnOptions,
} from 'typeorm'

const id: TableColumnOptions = { name: 'id', type: 'varchar', length: '36', isPrimary: true }
const uuid = (name: string, isNullable = false): TableColumnOptions => ({
  name,
  type: 'varchar',
  length: '36',
  isNullable,
})
const ts = (name: string, isNullable = false): TableColumnOptions => ({
  name,
  type: 'varchar',
  length: '32',
  isNullable,
})
const str = (name: string, length: number, isNullable = false): TableColumnOptions => ({
  name,
  type: 'varchar',
  length: String(length),
  isNullable,
})
const txt = (name: string, isNullable = false): TableColumnOptions => ({ name, type: 'text', isNullable })
const bool = (name: string, isNullable = false): TableColumnOptions => ({ name, type: 'boolean', isNullable })
const int = (name: string, isNullable = false): TableColumnOptions => ({ name, type: 'integer', isNullable })
const real = (name: string): TableColumnOptions => ({ name, type: 'real', isNullable: true })

const fk = (column: string, table: string, onDelete: 'CASCADE' | 'RESTRICT' | 'SET NULL' = 'RESTRICT') =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: table,
    referencedColumnNames: ['id'],
    onDelete,
  })

export class InitialSchema1764600000000 implements MigrationInterface {
  name = 'InitialSchema1764600000000'

  async up(q: QueryRunner): Promise<void> {
    const tables = [
      new Table({
        name: 'users',
        columns: [
          id,
          str('email', 254),
          str('name', 120),
          str('role', 16),
          txt('passwordHash'),
          bool('active'),
          int('tokenVersion'),
          ts('createdAt'),
          ts('updatedAt'),
          ts('lastSignInAt', true),
        ],
        uniques: [new TableUnique({ name: 'uq_users_email', columnNames: ['email'] })],
      }),
      new Table({
        name: 'refresh_tokens',
        columns: [
          id,
          uuid('userId'),
          uuid('familyId'),
          str('tokenHash', 64),
          ts('expiresAt'),
          ts('createdAt'),
          ts('revokedAt', true),
          uuid('replacedById', true),
        ],
        uniques: [new TableUnique({ name: 'uq_refresh_tokens_hash', columnNames: ['tokenHash'] })],
        indices: [new TableIndex({ name: 'idx_refresh_tokens_family', columnNames: ['familyId'] })],
        foreignKeys: [fk('userId', 'users', 'CASCADE')],
      }),
      new Table({
        name: 'password_resets',
        columns: [
          id,
          uuid('userId'),
          str('tokenHash', 64),
          ts('expiresAt'),
          ts('usedAt', true),
          ts('createdAt'),
        ],
        uniques: [new TableUnique({ name: 'uq_password_resets_hash', columnNames: ['tokenHash'] })],
        foreignKeys: [fk('userId', 'users', 'CASCADE')],
      }),
      new Table({
        name: 'cohorts',
        columns: [
          id,
          str('name', 120),
          txt('description'),
          uuid('ownerId'),
          bool('archived'),
          ts('createdAt'),
        ],
        foreignKeys: [fk('ownerId', 'users')],
      }),
      new Table({
        name: 'enrollments',
        columns: [id, uuid('cohortId'), uuid('userId'), ts('createdAt')],
        uniques: [
          new TableUnique({ name: 'uq_enrollments_cohort_user', columnNames: ['cohortId', 'userId'] }),
        ],
        foreignKeys: [fk('cohortId', 'cohorts', 'CASCADE'), fk('userId', 'users', 'CASCADE')],
      }),
      new Table({
        name: 'invitations',
        columns: [
          id,
          str('email', 254),
          str('name', 120),
          str('role', 16),
          uuid('cohortId', true),
          uuid('invitedById'),
          str('tokenHash', 64),
          ts('expiresAt'),
          ts('acceptedAt', true),
          ts('createdAt'),
        ],
        uniques: [new TableUnique({ name: 'uq_invitations_hash', columnNames: ['tokenHash'] })],
        foreignKeys: [fk('cohortId', 'cohorts', 'CASCADE'), fk('invitedById', 'users')],
      }),
      new Table({
        name: 'scenarios',
        columns: [
          id,
          str('key', 80),
          int('version'),
          str('title', 160),
          str('status', 16),
          txt('document'),
          uuid('createdById', true),
          ts('createdAt'),
        ],
        uniques: [new TableUnique({ name: 'uq_scenarios_key_version', columnNames: ['key', 'version'] })],
        foreignKeys: [fk('createdById', 'users', 'SET NULL')],
      }),
      new Table({
        name: 'assignments',
        columns: [
          id,
          uuid('cohortId'),
          uuid('scenarioId'),
          str('title', 160),
          ts('opensAt'),
          ts('dueAt'),
          int('attemptLimit', true),
          bool('hintsAllowed'),
          uuid('createdById'),
          ts('createdAt'),
        ],
        foreignKeys: [
          fk('cohortId', 'cohorts', 'CASCADE'),
          fk('scenarioId', 'scenarios'),
          fk('createdById', 'users'),
        ],
      }),
      new Table({
        name: 'attempts',
        columns: [
          id,
          uuid('userId'),
          uuid('assignmentId', true),
          uuid('scenarioId'),
          str('status', 16),
          txt('events'),
          int('eventCount'),
          bool('late'),
          ts('startedAt'),
          ts('updatedAt'),
          ts('submittedAt', true),
          real('autoScore'),
          bool('autoPassed', true),
          real('score'),
          bool('passed', true),
          txt('evidence', true),
          ts('gradedAt', true),
        ],
        indices: [
          new TableIndex({ name: 'idx_attempts_user', columnNames: ['userId'] }),
          new TableIndex({ name: 'idx_attempts_assignment', columnNames: ['assignmentId'] }),
        ],
        foreignKeys: [
          fk('userId', 'users', 'CASCADE'),
          fk('assignmentId', 'assignments', 'CASCADE'),
          fk('scenarioId', 'scenarios'),
        ],
      }),
      new Table({
        name: 'feedback',
        columns: [id, uuid('attemptId'), uuid('authorId'), txt('body'), ts('createdAt')],
        foreignKeys: [fk('attemptId', 'attempts', 'CASCADE'), fk('authorId', 'users')],
      }),
      new Table({
        name: 'audit_entries',
        columns: [
          id,
          uuid('actorId', true),
          str('action', 40),
          str('entityType', 40),
          uuid('entityId'),
          txt('fromValue', true),
          txt('toValue'),
          txt('reason'),
          ts('createdAt'),
        ],
        indices: [new TableIndex({ name: 'idx_audit_entity', columnNames: ['entityType', 'entityId'] })],
        foreignKeys: [fk('actorId', 'users', 'SET NULL')],
      }),
      new Table({
        name: 'mail_messages',
        columns: [
          id,
          str('fromAddress', 320),
          txt('toAddress'),
          txt('subject'),
          txt('text'),
          txt('html'),
          ts('receivedAt'),
        ],
      }),
      new Table({
        name: 'uploads',
        columns: [
          id,
          uuid('userId'),
          str('purpose', 32),
          str('originalName', 255),
          str('storedName', 80),
          str('mimeType', 120),
          int('size'),
          ts('createdAt'),
        ],
        foreignKeys: [fk('userId', 'users', 'CASCADE')],
      }),
    ]
    for (const table of tables) await q.createTable(table, false, true, true)
  }

  async down(q: QueryRunner): Promise<void> {
    for (const name of [
      'uploads',
      'mail_messages',
      'audit_entries',
      'feedback',
      'attempts',
      'assignments',
      'scenarios',
      'invitations',
      'enrollments',
      'cohorts',
      'password_resets',
      'refresh_tokens',
      'users',
    ]) {
      await q.dropTable(name)
    }
  }
}
