// Assistance levels (issue 15, item 2): an assignment's level, and the level each attempt was made at. Added with
// plain ALTER TABLE … ADD COLUMN (NOT NULL with a default, which SQLite allows) so SQLite keeps its triggers
// (see 1765300000000). Existing assignments without hints become assessments, the rest standard; existing
// attempts take their assignment's level (free practice: standard).
import type { MigrationInterface, QueryRunner } from 'typeorm'

export class AssistanceLevels1765700000000 implements MigrationInterface {
  name = 'AssistanceLevels1765700000000'

  async up(q: QueryRunner): Promise<void> {
    for (const table of ['assignments', 'attempts']) {
      await q.query(
        `ALTER TABLE "${table}" ADD COLUMN "assistanceLevel" varchar(16) NOT NULL DEFAULT 'standard'`,
      )
    }
    // hintsAllowed is a boolean on PostgreSQL and 0/1 on SQLite: NOT works on both.
    await q.query(`UPDATE "assignments" SET "assistanceLevel" = 'assessment' WHERE NOT "hintsAllowed"`)
    await q.query(
      `UPDATE "attempts" SET "assistanceLevel" = 'assessment'
       WHERE "assignmentId" IN (SELECT "id" FROM "assignments" WHERE "assistanceLevel" = 'assessment')`,
    )
  }

  async down(q: QueryRunner): Promise<void> {
    for (const table of ['attempts', 'assignments']) {
      await q.query(`ALTER TABLE "${table}" DROP COLUMN "assistanceLevel"`)
    }
  }
}
