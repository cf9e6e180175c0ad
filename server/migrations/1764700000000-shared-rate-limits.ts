// Rate-limit counters in the database, so instances behind one proxy share each client's budget.
// Table API again, so the same migration runs on SQLite and PostgreSQL.
import { Table, TableIndex, type MigrationInterface, type QueryRunner } from 'typeorm'

export class SharedRateLimits1764700000000 implements MigrationInterface {
  name = 'SharedRateLimits1764700000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createTable(
      new Table({
        name: 'rate_limit_counters',
        columns: [
          { name: 'key', type: 'varchar', length: '255', isPrimary: true },
          { name: 'hits', type: 'integer', isNullable: false },
          { name: 'resetAt', type: 'varchar', length: '32', isNullable: false },
        ],
        indices: [new TableIndex({ name: 'idx_rate_limit_counters_reset', columnNames: ['resetAt'] })],
      }),
      false,
      true,
      true,
    )
  }

  async down(q: QueryRunner): Promise<void> {
    await q.dropTable('rate_limit_counters')
  }
}
