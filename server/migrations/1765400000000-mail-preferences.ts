// Optional mail (issue 16, item 6): each user's choice of due-date reminders and the daily digest. Nullable
// with no default (null means "on", never chosen), added with plain ALTER TABLE … ADD COLUMN so SQLite
// keeps its triggers (see 1765300000000).
import type { MigrationInterface, QueryRunner } from 'typeorm'

const COLUMNS = ['dueReminders', 'dailyDigest'] as const

export class MailPreferences1765400000000 implements MigrationInterface {
  name = 'MailPreferences1765400000000'

  async up(q: QueryRunner): Promise<void> {
    for (const column of COLUMNS) await q.query(`ALTER TABLE "users" ADD COLUMN "${column}" boolean`)
  }

  async down(q: QueryRunner): Promise<void> {
    for (const column of COLUMNS) await q.query(`ALTER TABLE "users" DROP COLUMN "${column}"`)
  }
}
