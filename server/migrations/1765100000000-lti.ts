// Learning platforms (LTI 1.3): the tables of server/entities/lti.ts (Table API, the same on SQLite and
// PostgreSQL), and each assignment's score policy — which score a platform receives. The column is added
// with plain ALTER TABLE … ADD COLUMN (the same on both): TypeORM's addColumn rebuilds the table on SQLite,
// which would drop the gradebook triggers on assignments (migration 1764900000000).
import {
  Table,
  TableForeignKey,
  TableIndex,
  TableUnique,
  type MigrationInterface,
  type QueryRunner,
  type TableColumnOptions,
} from 'typeorm'

const str = (name: string, length: number, isNullable = false): TableColumnOptions => ({
  name,
  type: 'varchar',
  length: String(length),
  isNullable,
})
const id: TableColumnOptions = { ...str('id', 36), isPrimary: true }
const uuid = (name: string) => str(name, 36)
const ts = (name: string, isNullable = false) => str(name, 32, isNullable)
const txt = (name: string, isNullable = false): TableColumnOptions => ({ name, type: 'text', isNullable })
const hashKey = (name: string): TableColumnOptions => ({ ...str(name, 64), isPrimary: true })

const fk = (column: string, table: string, onDelete: 'CASCADE' | 'RESTRICT') =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: table,
    referencedColumnNames: ['id'],
    onDelete,
  })
const unique = (name: string, ...columnNames: string[]) => new TableUnique({ name, columnNames })
const index = (name: string, ...columnNames: string[]) => new TableIndex({ name, columnNames })

const TABLES = [
  new Table({
    name: 'lti_platforms',
    columns: [
      id,
      str('name', 120),
      str('issuer', 500),
      str('clientId', 255),
      str('authorizationEndpoint', 500),
      str('tokenEndpoint', 500),
      str('jwksUrl', 500),
      txt('extraFrameOrigins'),
      ts('createdAt'),
      ts('updatedAt'),
      ts('lastLaunchAt', true),
    ],
    uniques: [unique('uq_lti_platforms_issuer_client', 'issuer', 'clientId')],
  }),
  new Table({
    name: 'lti_deployments',
    columns: [id, uuid('platformId'), str('deploymentId', 255), ts('createdAt')],
    uniques: [unique('uq_lti_deployments_platform_deployment', 'platformId', 'deploymentId')],
    foreignKeys: [fk('platformId', 'lti_platforms', 'CASCADE')],
  }),
  new Table({
    name: 'lti_tool_keys',
    columns: [
      { ...str('id', 64), isPrimary: true },
      str('algorithm', 16),
      txt('publicJwk'),
      txt('privateKeyPem'),
      ts('createdAt'),
      ts('retiredAt', true),
    ],
  }),
  new Table({
    name: 'lti_logins',
    columns: [
      hashKey('stateHash'),
      uuid('platformId'),
      str('nonce', 64),
      str('bindingHash', 64),
      txt('loginParams'),
      ts('expiresAt'),
      ts('usedAt', true),
      ts('createdAt'),
    ],
    indices: [index('idx_lti_logins_expires', 'expiresAt')],
    foreignKeys: [fk('platformId', 'lti_platforms', 'CASCADE')],
  }),
  new Table({
    name: 'lti_handoffs',
    columns: [
      hashKey('codeHash'),
      uuid('userId'),
      uuid('platformId'),
      txt('destination'),
      ts('expiresAt'),
      ts('usedAt', true),
      ts('createdAt'),
    ],
    foreignKeys: [fk('userId', 'users', 'CASCADE'), fk('platformId', 'lti_platforms', 'CASCADE')],
  }),
  new Table({
    name: 'lti_identities',
    columns: [
      id,
      uuid('platformId'),
      str('issuer', 500),
      str('subject', 255),
      uuid('userId'),
      ts('createdAt'),
    ],
    uniques: [unique('uq_lti_identities_issuer_subject', 'issuer', 'subject')],
    indices: [index('idx_lti_identities_user', 'userId')],
    foreignKeys: [fk('platformId', 'lti_platforms', 'RESTRICT'), fk('userId', 'users', 'CASCADE')],
  }),
  new Table({
    name: 'lti_contexts',
    columns: [
      id,
      uuid('platformId'),
      str('contextId', 255),
      uuid('cohortId'),
      str('title', 255),
      txt('membershipsUrl', true),
      txt('lineItemsUrl', true),
      txt('agsScopes'),
      ts('lastRosterPullAt', true),
      ts('createdAt'),
      ts('updatedAt'),
    ],
    uniques: [
      unique('uq_lti_contexts_platform_context', 'platformId', 'contextId'),
      unique('uq_lti_contexts_cohort', 'cohortId'),
    ],
    foreignKeys: [fk('platformId', 'lti_platforms', 'RESTRICT'), fk('cohortId', 'cohorts', 'CASCADE')],
  }),
  new Table({
    name: 'lti_resource_links',
    columns: [
      id,
      uuid('contextRowId'),
      str('resourceLinkId', 255),
      uuid('assignmentId'),
      txt('lineItemUrl', true),
      ts('createdAt'),
      ts('updatedAt'),
    ],
    uniques: [unique('uq_lti_resource_links_context_link', 'contextRowId', 'resourceLinkId')],
    indices: [index('idx_lti_resource_links_assignment', 'assignmentId')],
    foreignKeys: [
      fk('contextRowId', 'lti_contexts', 'CASCADE'),
      fk('assignmentId', 'assignments', 'CASCADE'),
    ],
  }),
  new Table({
    name: 'lti_deep_link_requests',
    columns: [
      id,
      uuid('platformId'),
      str('deploymentId', 255),
      uuid('contextRowId'),
      uuid('userId'),
      txt('returnUrl'),
      txt('data', true),
      str('returnCodeHash', 64, true),
      txt('responseJwt', true),
      ts('expiresAt'),
      ts('respondedAt', true),
      ts('createdAt'),
    ],
    foreignKeys: [
      fk('platformId', 'lti_platforms', 'CASCADE'),
      fk('contextRowId', 'lti_contexts', 'CASCADE'),
      fk('userId', 'users', 'CASCADE'),
    ],
  }),
  new Table({
    name: 'lti_score_syncs',
    columns: [
      id,
      uuid('assignmentId'),
      uuid('userId'),
      str('state', 16),
      { name: 'score', type: 'real', isNullable: true },
      { name: 'tries', type: 'integer' },
      txt('problem', true),
      ts('changedAt'),
      ts('sentAt', true),
      ts('updatedAt'),
    ],
    uniques: [unique('uq_lti_score_syncs_assignment_user', 'assignmentId', 'userId')],
    foreignKeys: [fk('assignmentId', 'assignments', 'CASCADE'), fk('userId', 'users', 'CASCADE')],
  }),
]

export class Lti1765100000000 implements MigrationInterface {
  name = 'Lti1765100000000'

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "assignments" ADD COLUMN "scorePolicy" varchar(8) NOT NULL DEFAULT 'best'`)
    for (const table of TABLES) await q.createTable(table, false, true, true)
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of [...TABLES].reverse()) await q.dropTable(table.name)
    await q.query(`ALTER TABLE "assignments" DROP COLUMN "scorePolicy"`)
  }
}
