// The instructor's week (issue 16): centre settings (name, time zone); late policy, audience and
// per-apprentice exceptions of assignments; reviewed and override marks on attempts; co-instructors and
// the practice policy of cohorts. The gradebook's covering index gains `late`, and the two new tables a
// gradebook shows bump the cohort's gradebookRevision like the others (see 1764900000000).
// New columns are added with plain ALTER TABLE … ADD COLUMN: TypeORM's addColumn rebuilds an SQLite table,
// which would drop the revision triggers on it. They are nullable, with no default (a default makes
// TypeORM re-read inserted rows on SQLite; see CohortRow.gradebookRevision).
import {
  Table,
  TableForeignKey,
  TableIndex,
  TableUnique,
  type MigrationInterface,
  type QueryRunner,
  type TableColumnOptions,
} from 'typeorm'
import { GRADEBOOK_INDEX_COLUMNS, GRADEBOOK_INDEX_NAME } from './1764800000000-gradebook-covering-index'

const id: TableColumnOptions = { name: 'id', type: 'varchar', length: '36', isPrimary: true }
const uuid = (name: string): TableColumnOptions => ({ name, type: 'varchar', length: '36' })
const ts = (name: string, isNullable = false): TableColumnOptions => ({
  name,
  type: 'varchar',
  length: '32',
  isNullable,
})
const cascade = (column: string, table: string) =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: table,
    referencedColumnNames: ['id'],
    onDelete: 'CASCADE',
  })

/** Columns added to existing tables, as SQL both databases read the same way. */
export const ADDED_COLUMNS: Record<string, [string, string][]> = {
  assignments: [
    ['latePolicy', 'varchar(16)'],
    ['latePenalty', 'integer'],
    ['audience', 'varchar(16)'],
  ],
  attempts: [
    ['reviewedAt', 'varchar(32)'],
    ['reviewedById', 'varchar(36)'],
    ['overriddenAt', 'varchar(32)'],
    ['overrideReason', 'text'],
  ],
  cohorts: [['practiceKeys', 'text']],
}

/** The gradebook's covering index, now with `late` (on time and late attempts are summed apart). */
export const GRADEBOOK_INDEX_COLUMNS_WITH_LATE = [...GRADEBOOK_INDEX_COLUMNS.slice(0, -1), 'late', 'id']

const BUMP = `UPDATE "cohorts" SET "gradebookRevision" = "gradebookRevision" + 1`
/** New tables a gradebook shows; each row names an assignment, which names the cohort. */
const WATCHED = ['assignment_exceptions', 'assignment_recipients'] as const
const cohortOf = (row: string) => `SELECT "cohortId" FROM "assignments" WHERE "id" = ${row}."assignmentId"`

function triggers(table: string, postgres: boolean): string[] {
  if (postgres) {
    const fn = `"gradebook_touch_${table}"`
    return [
      `CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
       BEGIN
         IF TG_OP <> 'INSERT' THEN ${BUMP} WHERE "id" IN (${cohortOf('OLD')}); END IF;
         IF TG_OP <> 'DELETE' THEN ${BUMP} WHERE "id" IN (${cohortOf('NEW')}); END IF;
         RETURN NULL;
       END $$`,
      `CREATE TRIGGER "trg_gradebook_${table}" AFTER INSERT OR UPDATE OR DELETE ON "${table}" FOR EACH ROW EXECUTE FUNCTION ${fn}()`,
    ]
  }
  const body = (rows: string[]) => `BEGIN ${BUMP} WHERE "id" IN (${rows.map(cohortOf).join(' UNION ')}); END`
  return [
    `CREATE TRIGGER "trg_gradebook_${table}_insert" AFTER INSERT ON "${table}" ${body(['NEW'])}`,
    `CREATE TRIGGER "trg_gradebook_${table}_update" AFTER UPDATE ON "${table}" ${body(['OLD', 'NEW'])}`,
    `CREATE TRIGGER "trg_gradebook_${table}_delete" AFTER DELETE ON "${table}" ${body(['OLD'])}`,
  ]
}

export class InstructorWeek1765300000000 implements MigrationInterface {
  name = 'InstructorWeek1765300000000'

  async up(q: QueryRunner): Promise<void> {
    const postgres = q.connection.options.type === 'postgres'
    await q.createTable(
      new Table({
        name: 'centre_settings',
        columns: [
          { name: 'id', type: 'varchar', length: '16', isPrimary: true },
          { name: 'name', type: 'varchar', length: '120' },
          { name: 'timeZone', type: 'varchar', length: '64' },
          ts('updatedAt'),
        ],
      }),
    )
    await q.createTable(
      new Table({
        name: 'assignment_exceptions',
        columns: [
          id,
          uuid('assignmentId'),
          uuid('userId'),
          ts('dueAt', true),
          { name: 'extraAttempts', type: 'integer' },
          { name: 'excused', type: 'boolean' },
          { name: 'reason', type: 'text' },
          uuid('createdById'),
          ts('updatedAt'),
        ],
        uniques: [
          new TableUnique({ name: 'uq_assignment_exceptions_pair', columnNames: ['assignmentId', 'userId'] }),
        ],
        foreignKeys: [
          cascade('assignmentId', 'assignments'),
          cascade('userId', 'users'),
          cascade('createdById', 'users'),
        ],
      }),
    )
    await q.createTable(
      new Table({
        name: 'assignment_recipients',
        columns: [id, uuid('assignmentId'), uuid('userId'), ts('createdAt')],
        uniques: [
          new TableUnique({ name: 'uq_assignment_recipients_pair', columnNames: ['assignmentId', 'userId'] }),
        ],
        foreignKeys: [cascade('assignmentId', 'assignments'), cascade('userId', 'users')],
      }),
    )
    await q.createTable(
      new Table({
        name: 'cohort_instructors',
        columns: [id, uuid('cohortId'), uuid('userId'), ts('createdAt')],
        uniques: [
          new TableUnique({ name: 'uq_cohort_instructors_pair', columnNames: ['cohortId', 'userId'] }),
        ],
        indices: [new TableIndex({ name: 'idx_cohort_instructors_user', columnNames: ['userId'] })],
        foreignKeys: [cascade('cohortId', 'cohorts'), cascade('userId', 'users')],
      }),
    )
    for (const [table, columns] of Object.entries(ADDED_COLUMNS)) {
      for (const [column, type] of columns)
        await q.query(`ALTER TABLE "${table}" ADD COLUMN "${column}" ${type}`)
    }
    await q.dropIndex('attempts', GRADEBOOK_INDEX_NAME)
    await q.createIndex(
      'attempts',
      new TableIndex({ name: GRADEBOOK_INDEX_NAME, columnNames: GRADEBOOK_INDEX_COLUMNS_WITH_LATE }),
    )
    for (const table of WATCHED) for (const sql of triggers(table, postgres)) await q.query(sql)
    // Overrides and reviews made before this migration: the latest override's reason and time, and the
    // first review (feedback or override) as the moment the attempt was reviewed.
    const latestOverride = (column: string) =>
      `(SELECT "${column}" FROM "audit_entries" WHERE "entityType" = 'attempt' AND "entityId" = "attempts"."id"
        AND "action" = 'grade.overridden' ORDER BY "createdAt" DESC LIMIT 1)`
    await q.query(
      `UPDATE "attempts" SET "overrideReason" = ${latestOverride('reason')},
         "overriddenAt" = ${latestOverride('createdAt')}
       WHERE EXISTS (SELECT 1 FROM "audit_entries" WHERE "entityType" = 'attempt'
         AND "entityId" = "attempts"."id" AND "action" = 'grade.overridden')`,
    )
    await q.query(
      `UPDATE "attempts" SET
         "reviewedAt" = (SELECT MIN("createdAt") FROM "feedback" WHERE "attemptId" = "attempts"."id"),
         "reviewedById" = (SELECT "authorId" FROM "feedback" WHERE "attemptId" = "attempts"."id"
           ORDER BY "createdAt" ASC LIMIT 1)
       WHERE EXISTS (SELECT 1 FROM "feedback" WHERE "attemptId" = "attempts"."id")`,
    )
    await q.query(
      `UPDATE "attempts" SET "reviewedAt" = "overriddenAt" WHERE "reviewedAt" IS NULL AND "overriddenAt" IS NOT NULL`,
    )
  }

  async down(q: QueryRunner): Promise<void> {
    const postgres = q.connection.options.type === 'postgres'
    for (const table of WATCHED) {
      if (postgres) {
        await q.query(`DROP TRIGGER IF EXISTS "trg_gradebook_${table}" ON "${table}"`)
        await q.query(`DROP FUNCTION IF EXISTS "gradebook_touch_${table}"()`)
      } else {
        for (const op of ['insert', 'update', 'delete'])
          await q.query(`DROP TRIGGER IF EXISTS "trg_gradebook_${table}_${op}"`)
      }
    }
    await q.dropIndex('attempts', GRADEBOOK_INDEX_NAME)
    await q.createIndex(
      'attempts',
      new TableIndex({ name: GRADEBOOK_INDEX_NAME, columnNames: GRADEBOOK_INDEX_COLUMNS }),
    )
    for (const [table, columns] of Object.entries(ADDED_COLUMNS)) {
      for (const [column] of columns) await q.query(`ALTER TABLE "${table}" DROP COLUMN "${column}"`)
    }
    for (const table of [
      'cohort_instructors',
      'assignment_recipients',
      'assignment_exceptions',
      'centre_settings',
    ])
      await q.dropTable(table)
  }
}
