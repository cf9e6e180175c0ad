// Withdrawn sign-offs of learning outcomes (entities/outcome-sign-off-withdrawal.ts). Table API: SQLite and
// PostgreSQL.
import { Table, TableForeignKey, TableIndex, type MigrationInterface, type QueryRunner } from 'typeorm'

const fk = (column: string, table: string, onDelete: 'CASCADE' | 'RESTRICT') =>
  new TableForeignKey({
    columnNames: [column],
    referencedTableName: table,
    referencedColumnNames: ['id'],
    onDelete,
  })

export class SignOffWithdrawals1765600000000 implements MigrationInterface {
  name = 'SignOffWithdrawals1765600000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createTable(
      new Table({
        name: 'outcome_sign_off_withdrawals',
        columns: [
          { name: 'id', type: 'varchar', length: '36', isPrimary: true },
          { name: 'apprenticeId', type: 'varchar', length: '36', isNullable: false },
          { name: 'cohortId', type: 'varchar', length: '36', isNullable: false },
          { name: 'scenarioKey', type: 'varchar', length: '80', isNullable: false },
          { name: 'outcome', type: 'varchar', length: '500', isNullable: false },
          { name: 'note', type: 'text', isNullable: false },
          { name: 'signedById', type: 'varchar', length: '36', isNullable: false },
          { name: 'signedAt', type: 'varchar', length: '32', isNullable: false },
          { name: 'withdrawnById', type: 'varchar', length: '36', isNullable: false },
          { name: 'withdrawnAt', type: 'varchar', length: '32', isNullable: false },
          { name: 'reason', type: 'text', isNullable: false },
        ],
        indices: [
          new TableIndex({
            name: 'idx_outcome_sign_off_withdrawals_apprentice',
            columnNames: ['apprenticeId'],
          }),
        ],
        foreignKeys: [
          fk('apprenticeId', 'users', 'CASCADE'),
          fk('cohortId', 'cohorts', 'CASCADE'),
          fk('signedById', 'users', 'RESTRICT'),
          fk('withdrawnById', 'users', 'RESTRICT'),
        ],
      }),
      false,
      true,
      true,
    )
  }

  async down(q: QueryRunner): Promise<void> {
    await q.dropTable('outcome_sign_off_withdrawals')
  }
}
