// Scenario authoring (issue 17; entities/scenario-draft.ts): one working draft per key, one reference
// solution per key, and each published version's reference result. Table API and a plain ADD COLUMN
// (nullable, which SQLite allows without rebuilding the table): SQLite and PostgreSQL.
import { Table, TableForeignKey, type MigrationInterface, type QueryRunner } from 'typeorm'

const byUser = (column: string) =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: 'users',
    referencedColumnNames: ['id'],
    onDelete: 'SET NULL',
  })
const time = (name: string) => ({ name, type: 'varchar', length: '32', isNullable: false })
const userId = (name: string) => ({ name, type: 'varchar', length: '36', isNullable: true })

export class ScenarioAuthoring1765900000000 implements MigrationInterface {
  name = 'ScenarioAuthoring1765900000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createTable(
      new Table({
        name: 'scenario_drafts',
        columns: [
          { name: 'key', type: 'varchar', length: '80', isPrimary: true, isNullable: false },
          { name: 'document', type: 'text', isNullable: false },
          { name: 'baseVersion', type: 'integer', isNullable: true },
          time('createdAt'),
          time('updatedAt'),
          userId('updatedById'),
        ],
        foreignKeys: [byUser('updatedById')],
      }),
      false,
      true,
      true,
    )
    await q.createTable(
      new Table({
        name: 'scenario_reference_solutions',
        columns: [
          { name: 'key', type: 'varchar', length: '80', isPrimary: true, isNullable: false },
          { name: 'events', type: 'text', isNullable: false },
          time('recordedAt'),
          userId('recordedById'),
        ],
        foreignKeys: [byUser('recordedById')],
      }),
      false,
      true,
      true,
    )
    await q.query(`ALTER TABLE "scenarios" ADD COLUMN "referenceResult" text NULL`)
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "scenarios" DROP COLUMN "referenceResult"`)
    await q.dropTable('scenario_reference_solutions')
    await q.dropTable('scenario_drafts')
  }
}
