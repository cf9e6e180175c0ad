// Reading drafts without grading them all again (entities/scenario-draft.ts, scenarios/reference-grade.ts):
// each draft keeps its reference solution's last grade and a fingerprint of what was graded. Plain nullable
// ADD COLUMNs (SQLite allows them without rebuilding the table): SQLite and PostgreSQL. Existing drafts
// start with none and are graded once on their next read.
import type { MigrationInterface, QueryRunner } from 'typeorm'

export class DraftReferenceGrade1766000000000 implements MigrationInterface {
  name = 'DraftReferenceGrade1766000000000'

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "scenario_drafts" ADD COLUMN "referenceFingerprint" varchar(64) NULL`)
    await q.query(`ALTER TABLE "scenario_drafts" ADD COLUMN "referenceResult" text NULL`)
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "scenario_drafts" DROP COLUMN "referenceResult"`)
    await q.query(`ALTER TABLE "scenario_drafts" DROP COLUMN "referenceFingerprint"`)
  }
}
