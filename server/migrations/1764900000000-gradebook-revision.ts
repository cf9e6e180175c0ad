// A revision counter per cohort that the database itself bumps whenever anything a gradebook shows changes:
// an attempt (insert, update, delete), an enrolment, an assignment, or an enrolled apprentice's name or
// e-mail. Triggers rather than application code, so no write path (today's or a future one) can forget it,
// and every instance behind a load balancer sees the same counter: each caches a cohort's gradebook and
// serves it until the revision it reads with the cohort row moves on (gradebook/gradebook-cache.ts).
// Plain SQL per driver: TypeORM's Table API has no triggers. ALTER TABLE … ADD COLUMN is the same on both.
import type { MigrationInterface, QueryRunner } from 'typeorm'

export const GRADEBOOK_REVISION_COLUMN = 'gradebookRevision'

const BUMP = `UPDATE "cohorts" SET "gradebookRevision" = "gradebookRevision" + 1`

/** Which cohorts a row of each watched table belongs to, as SQL over the trigger's OLD / NEW row. */
const cohortsOf = {
  attempts: (row: string) => `SELECT "cohortId" FROM "assignments" WHERE "id" = ${row}."assignmentId"`,
  enrollments: (row: string) => `SELECT ${row}."cohortId"`,
  assignments: (row: string) => `SELECT ${row}."cohortId"`,
  users: (row: string) => `SELECT "cohortId" FROM "enrollments" WHERE "userId" = ${row}."id"`,
} as const

type Watched = keyof typeof cohortsOf
const WATCHED = Object.keys(cohortsOf) as Watched[]
/** Users change in many ways (sign-in times, token versions); only these two appear in a gradebook. */
const USER_COLUMNS = '"name", "email"'

function sqliteTriggers(table: Watched): string[] {
  const name = (op: string) => `"trg_gradebook_${table}_${op}"`
  const body = (rows: string[]) =>
    `BEGIN ${BUMP} WHERE "id" IN (${rows.map(cohortsOf[table]).join(' UNION ')}); END`
  if (table === 'users') {
    return [`CREATE TRIGGER ${name('update')} AFTER UPDATE OF ${USER_COLUMNS} ON "users" ${body(['NEW'])}`]
  }
  return [
    `CREATE TRIGGER ${name('insert')} AFTER INSERT ON "${table}" ${body(['NEW'])}`,
    `CREATE TRIGGER ${name('update')} AFTER UPDATE ON "${table}" ${body(['OLD', 'NEW'])}`,
    `CREATE TRIGGER ${name('delete')} AFTER DELETE ON "${table}" ${body(['OLD'])}`,
  ]
}

function postgresTriggers(table: Watched): string[] {
  const fn = `"gradebook_touch_${table}"`
  const bump = (row: string) => `${BUMP} WHERE "id" IN (${cohortsOf[table](row)});`
  const events = table === 'users' ? `UPDATE OF ${USER_COLUMNS}` : 'INSERT OR UPDATE OR DELETE'
  return [
    `CREATE FUNCTION ${fn}() RETURNS trigger LANGUAGE plpgsql AS $$
     BEGIN
       IF TG_OP <> 'INSERT' THEN ${bump('OLD')} END IF;
       IF TG_OP <> 'DELETE' THEN ${bump('NEW')} END IF;
       RETURN NULL;
     END $$`,
    `CREATE TRIGGER "trg_gradebook_${table}" AFTER ${events} ON "${table}" FOR EACH ROW EXECUTE FUNCTION ${fn}()`,
  ]
}

export class GradebookRevision1764900000000 implements MigrationInterface {
  name = 'GradebookRevision1764900000000'

  async up(q: QueryRunner): Promise<void> {
    const postgres = q.connection.options.type === 'postgres'
    await q.query(
      `ALTER TABLE "cohorts" ADD COLUMN "${GRADEBOOK_REVISION_COLUMN}" integer NOT NULL DEFAULT 0`,
    )
    for (const table of WATCHED) {
      for (const sql of postgres ? postgresTriggers(table) : sqliteTriggers(table)) await q.query(sql)
    }
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
    await q.query(`ALTER TABLE "cohorts" DROP COLUMN "${GRADEBOOK_REVISION_COLUMN}"`)
  }
}
