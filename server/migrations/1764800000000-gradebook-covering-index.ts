// A covering index for the gradebook: every column the standing computation reads is in the index, so the
// query never touches the wide attempt rows (event log, evidence). Table API, so SQLite and PostgreSQL agree.
import { TableIndex, type MigrationInterface, type QueryRunner } from 'typeorm'

export const GRADEBOOK_INDEX_NAME = 'idx_attempts_gradebook'

/** The attempts columns read by the gradebook, lookup keys first. Mirrored in the Attempt entity. */
export const GRADEBOOK_INDEX_COLUMNS = [
  'assignmentId',
  'userId',
  'status',
  'score',
  'passed',
  'updatedAt',
  'submittedAt',
  'id',
]

export class GradebookCoveringIndex1764800000000 implements MigrationInterface {
  name = 'GradebookCoveringIndex1764800000000'

  async up(q: QueryRunner): Promise<void> {
    await q.createIndex(
      'attempts',
      new TableIndex({ name: GRADEBOOK_INDEX_NAME, columnNames: GRADEBOOK_INDEX_COLUMNS }),
    )
  }

  async down(q: QueryRunner): Promise<void> {
    await q.dropIndex('attempts', GRADEBOOK_INDEX_NAME)
  }
}
