// The database layer: migrations build exactly the schema the entities describe, undo cleanly, and the
// connection runs with WAL, foreign keys and a busy timeout.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { DataSource } from 'typeorm'
import { openDatabase } from '../../server/infrastructure/database/data-source'

describe('database', () => {
  let dir: string
  let ds: DataSource
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'slipway-db-test-'))
    ds = await openDatabase({ databasePath: join(dir, 'test.sqlite') })
  })
  afterAll(async () => {
    await ds.destroy()
    rmSync(dir, { recursive: true, force: true })
  })

  it('leaves nothing for synchronize to change after the migrations (entities and migrations agree)', async () => {
    const pending = await ds.driver.createSchemaBuilder().log()
    expect(pending.upQueries.map((q) => q.query)).toEqual([])
  })

  it('runs with WAL journalling, foreign keys on and a busy timeout', async () => {
    expect(await ds.query('PRAGMA journal_mode')).toEqual([{ journal_mode: 'wal' }])
    expect(await ds.query('PRAGMA foreign_keys')).toEqual([{ foreign_keys: 1 }])
    const [{ timeout }] = await ds.query('PRAGMA busy_timeout')
    expect(timeout).toBeGreaterThanOrEqual(1000)
  })

  it('indexes every column the gradebook reads, lookup keys first (a covering index)', async () => {
    const columns = (await ds.query(`PRAGMA index_info('idx_attempts_gradebook')`)).map(
      (c: { name: string }) => c.name,
    )
    expect(columns).toEqual([
      'assignmentId',
      'userId',
      'status',
      'score',
      'passed',
      'updatedAt',
      'submittedAt',
      'late',
      'id',
    ])
  })

  it('answers the gradebook query from the covering index alone, without reading attempt rows', async () => {
    // sqlite.org "EXPLAIN QUERY PLAN": a query satisfied by the index alone reports "USING COVERING INDEX".
    // The shape of standingsByAssignmentAndUser's query: grouped per pair, straight off the index.
    const plan = await ds.query(
      `EXPLAIN QUERY PLAN SELECT assignmentId, userId,
         SUM(CASE WHEN status = 'submitted' AND score IS NOT NULL THEN 1 ELSE 0 END),
         MAX(CASE WHEN status = 'submitted' AND score IS NOT NULL THEN score END),
         MAX(CASE WHEN status = 'submitted' AND score IS NOT NULL AND NOT late THEN score END),
         MAX(CASE WHEN status = 'submitted' AND score IS NOT NULL AND late THEN score END),
         MAX(CASE WHEN status = 'submitted' AND score IS NOT NULL AND passed AND NOT late THEN 1 ELSE 0 END),
         MAX(CASE WHEN status = 'submitted' AND score IS NOT NULL AND passed AND late THEN 1 ELSE 0 END),
         MAX(updatedAt), MIN(CASE WHEN status = 'inProgress' THEN id END)
       FROM attempts WHERE assignmentId IN ('a1', 'a2') GROUP BY assignmentId, userId`,
    )
    expect(plan.map((step: { detail: string }) => step.detail).join('\n')).toMatch(
      /USING COVERING INDEX idx_attempts_gradebook/,
    )
  })

  it('refuses a row that points at nothing (foreign keys are enforced)', async () => {
    await expect(
      ds.query(
        `INSERT INTO enrollments (id, cohortId, userId, createdAt) VALUES ('e1', 'no-cohort', 'no-user', '2026-01-01T00:00:00.000Z')`,
      ),
    ).rejects.toThrow(/FOREIGN KEY/)
  })

  it('makes an assignment without hints an assessment, and its attempts too (migration 1765700000000)', async () => {
    const scratch = await openDatabase({ databasePath: join(dir, 'levels.sqlite') })
    try {
      // Back to before assistance levels (undoing the later ones first).
      const last = async () =>
        (await scratch.query('SELECT name FROM migrations ORDER BY id DESC LIMIT 1'))[0].name as string
      while ((await last()) !== 'AssistanceLevels1765700000000') await scratch.undoLastMigration()
      await scratch.undoLastMigration()
      await scratch.query('PRAGMA foreign_keys = OFF') // bare rows, without their people and cohorts
      const at = '2026-01-01T00:00:00.000Z'
      for (const [id, hints] of [
        ['open', 1],
        ['strict', 0],
      ] as const) {
        await scratch.query(
          `INSERT INTO assignments (id, cohortId, scenarioId, title, opensAt, dueAt, attemptLimit, hintsAllowed, createdById, createdAt)
           VALUES (?, 'c', 's', ?, ?, ?, NULL, ?, 'u', ?)`,
          [id, id, at, at, hints, at],
        )
      }
      for (const [id, assignmentId] of [
        ['on-open', 'open'],
        ['on-strict', 'strict'],
        ['practice', null],
      ]) {
        await scratch.query(
          `INSERT INTO attempts (id, userId, assignmentId, scenarioId, status, events, eventCount, late, startedAt, updatedAt)
           VALUES (?, 'u', ?, 's', 'inProgress', '[]', 0, 0, ?, ?)`,
          [id, assignmentId, at, at],
        )
      }
      await scratch.runMigrations()
      const levels = async (table: string) =>
        Object.fromEntries(
          (await scratch.query(`SELECT id, assistanceLevel FROM ${table} ORDER BY id`)).map(
            (r: { id: string; assistanceLevel: string }) => [r.id, r.assistanceLevel],
          ),
        )
      expect(await levels('assignments')).toEqual({ open: 'standard', strict: 'assessment' })
      expect(await levels('attempts')).toEqual({
        'on-open': 'standard',
        'on-strict': 'assessment',
        practice: 'standard',
      })
    } finally {
      await scratch.destroy()
    }
  })

  it('undoes every migration, leaving no application tables', async () => {
    const scratch = await openDatabase({ databasePath: join(dir, 'scratch.sqlite') })
    try {
      while ((await scratch.query('SELECT COUNT(*) AS n FROM migrations'))[0].n > 0)
        await scratch.undoLastMigration()
      const tables = (await scratch.query(`SELECT name FROM sqlite_master WHERE type = 'table'`)).map(
        (t: { name: string }) => t.name,
      )
      expect(tables.filter((name: string) => !['migrations', 'sqlite_sequence'].includes(name))).toEqual([])
    } finally {
      await scratch.destroy()
    }
  })
})
