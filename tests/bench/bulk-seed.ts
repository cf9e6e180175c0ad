// Bulk seeding for load tests: a large invented training centre written straight into SQLite in one
// transaction (seconds, not minutes). Grades come from the real grader, run once per fixture log and reused.
import { randomUUID } from 'node:crypto'
import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'
import type { DataSource } from 'typeorm'
import { attemptLogSchema, type AttemptEvent } from '../../shared/model/events'
import type { Scenario } from '../../shared/scenario/schema'
import { OWASP_ARGON2ID } from '../../server/config'
import { openDatabase } from '../../server/infrastructure/database/data-source'
import { ScenarioEntity } from '../../server/entities'
import { SCENARIOS_DIR } from '../../server/prepare-database'
import { gradeAttempt, type GradeOutcome } from '../../server/infrastructure/grading/grading'
import { createPasswordHasher } from '../../server/infrastructure/security/passwords'
import { importShippedScenarios } from '../../server/scenarios/scenarios.service'

export const FIXTURE_DIR = new URL('../fixtures/attempts/', import.meta.url).pathname
export const BENCH_PASSWORD = 'load-test-bench-passphrase'
export const BENCH_DOMAIN = 'harrowmere.example'

export interface BulkShape {
  apprentices: number
  cohorts: number
  assignmentsPerCohort: number
  attempts: number
}

/** The issue's figures: 500 apprentices, 40 assignments, 20,000 attempts (5 cohorts of 100, 8 assignments each). */
export const ISSUE_SHAPE: BulkShape = {
  apprentices: 500,
  cohorts: 5,
  assignmentsPerCohort: 8,
  attempts: 20_000,
}

export interface BulkSeedResult {
  instructors: { id: string; email: string; cohortId: string }[]
  apprentices: { id: string; email: string; cohortId: string }[]
  cohorts: string[]
  /** assignments[c] = the assignment ids of cohort c; the first of each uses `raise-lower-commissioning`. */
  assignments: string[][]
  /** The scenario version id each assignment sets. */
  assignmentScenarios: Record<string, string>
  counts: { users: number; cohorts: number; assignments: number; attempts: number }
  seedMs: number
}

/** mulberry32: deterministic, so every run seeds the same centre. */
function prng(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

export function fixtureLog(scenarioKey: string, name = 'reference'): AttemptEvent[] {
  const raw = JSON.parse(readFileSync(join(FIXTURE_DIR, `${scenarioKey}--${name}.json`), 'utf8'))
  return attemptLogSchema.parse(raw.events)
}

/**
 * A fixture log padded to `count` events with meter-probe moves between its own events, so the log
 * still replays and grades like the original but costs what a long attempt costs to validate and replay.
 */
export function paddedLog(base: AttemptEvent[], count: number): AttemptEvent[] {
  const points = ['drive.p24', 'drive.0v', 'drive.di1', 'drive.di2', 'drive.dcom', null] as const
  const extra = Math.max(0, count - base.length)
  const out: AttemptEvent[] = []
  // One slot for the closing probe removal below; gaps before the end marker take the rest.
  const gaps = base.filter((e, i) => i > 0 && e.type !== 'attempt.ended').length
  const perGap = Math.ceil((extra - 1) / Math.max(1, gaps))
  let added = 0
  for (let i = 0; i < base.length; i++) {
    out.push(base[i]!)
    const next = base[i + 1]
    if (!next || next.type === 'attempt.ended') continue
    for (let k = 0; k < perGap && added < extra - 1; k++, added++) {
      const t = base[i]!.t + Math.floor(((next.t - base[i]!.t) * (k + 1)) / (perGap + 1))
      out.push({ t, type: 'meter.probes', red: points[added % 6]!, black: points[(added + 3) % 6]! })
    }
  }
  // The probes end where they started: off the circuit.
  const end = out.findIndex((e) => e.type === 'attempt.ended')
  const tail = end === -1 ? out.length : end
  out.splice(tail, 0, { t: out[tail - 1]!.t, type: 'meter.probes', red: null, black: null })
  return out
}

interface Graded {
  events: string
  eventCount: number
  grade: GradeOutcome
}

function gradedFixtures(scenarios: { id: string; key: string; document: string }[]) {
  const files = readdirSync(FIXTURE_DIR).filter((f) => f.endsWith('.json'))
  const byScenario = new Map<string, Graded[]>()
  for (const scenario of scenarios) {
    const doc = JSON.parse(scenario.document) as Scenario
    const graded = files
      .filter((f) => f.startsWith(`${scenario.key}--`))
      .map((f) => {
        const events = fixtureLog(scenario.key, f.slice(scenario.key.length + 2, -5))
        return { events: JSON.stringify(events), eventCount: events.length, grade: gradeAttempt(doc, events) }
      })
    if (graded.length) byScenario.set(scenario.id, graded)
  }
  return byScenario
}

type Db = {
  prepare(sql: string): { run(...params: unknown[]): unknown }
  transaction(fn: () => void): () => void
}

function insertStatement(db: Db, table: string, columns: string[]) {
  const sql = `INSERT INTO "${table}" (${columns.map((c) => `"${c}"`).join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`
  return db.prepare(sql)
}

/** Migrates the database at `databasePath`, imports the shipped scenarios, then writes the whole centre. */
export async function bulkSeed(
  databasePath: string,
  shape: BulkShape = ISSUE_SHAPE,
): Promise<BulkSeedResult> {
  const started = performance.now()
  const ds: DataSource = await openDatabase({ databasePath })
  try {
    await importShippedScenarios(ds, SCENARIOS_DIR)
    const scenarios = await ds.getRepository(ScenarioEntity).find({ order: { key: 'ASC' } })
    const graded = gradedFixtures(scenarios)
    const usable = scenarios.filter((s) => graded.has(s.id))
    const first = usable.find((s) => s.key === 'raise-lower-commissioning') ?? usable[0]!
    const ordered = [first, ...usable.filter((s) => s !== first)]
    // One argon2id hash with the production cost, shared by every seeded account.
    const hash = await createPasswordHasher(OWASP_ARGON2ID).hash(BENCH_PASSWORD)
    const random = prng(20_261_201)
    const db = (ds.driver as unknown as { databaseConnection: Db }).databaseConnection
    const insertUser = insertStatement(db, 'users', [
      'id', 'email', 'name', 'role', 'passwordHash', 'active', 'tokenVersion', 'createdAt', 'updatedAt', 'lastSignInAt',
    ]) // prettier-ignore
    const insertCohort = insertStatement(db, 'cohorts', [
      'id', 'name', 'description', 'ownerId', 'archived', 'createdAt',
    ]) // prettier-ignore
    const insertEnrollment = insertStatement(db, 'enrollments', ['id', 'cohortId', 'userId', 'createdAt'])
    const insertAssignment = insertStatement(db, 'assignments', [
      'id', 'cohortId', 'scenarioId', 'title', 'opensAt', 'dueAt', 'attemptLimit', 'hintsAllowed', 'createdById', 'createdAt',
    ]) // prettier-ignore
    const insertAttempt = insertStatement(db, 'attempts', [
      'id', 'userId', 'assignmentId', 'scenarioId', 'status', 'events', 'eventCount', 'late', 'startedAt',
      'updatedAt', 'submittedAt', 'autoScore', 'autoPassed', 'score', 'passed', 'evidence', 'gradedAt',
    ]) // prettier-ignore

    const now = Date.now()
    const iso = (ms: number) => new Date(ms).toISOString()
    const result: BulkSeedResult = {
      instructors: [],
      apprentices: [],
      cohorts: [],
      assignments: [],
      assignmentScenarios: {},
      counts: { users: 0, cohorts: 0, assignments: 0, attempts: 0 },
      seedMs: 0,
    }
    const assignmentScenario = new Map<string, string>()
    db.transaction(() => {
      const created = iso(now - 60 * 86_400_000)
      insertUser.run(
        randomUUID(),
        `admin@${BENCH_DOMAIN}`,
        'Centre Administrator',
        'admin',
        hash,
        1,
        0,
        created,
        created,
        null,
      )
      for (let c = 0; c < shape.cohorts; c++) {
        const instructorId = randomUUID()
        const email = `instructor${c + 1}@${BENCH_DOMAIN}`
        insertUser.run(
          instructorId,
          email,
          `Instructor ${c + 1}`,
          'instructor',
          hash,
          1,
          0,
          created,
          created,
          null,
        )
        const cohortId = randomUUID()
        insertCohort.run(
          cohortId,
          `Load-test intake ${c + 1}`,
          'Invented cohort for benchmarks.',
          instructorId,
          0,
          created,
        )
        result.cohorts.push(cohortId)
        result.instructors.push({ id: instructorId, email, cohortId })
        const ids: string[] = []
        for (let a = 0; a < shape.assignmentsPerCohort; a++) {
          const scenario = ordered[a % ordered.length]!
          const id = randomUUID()
          const opens = iso(now - (40 - a) * 86_400_000)
          const due = iso(now + (a + 1) * 86_400_000)
          insertAssignment.run(
            id,
            cohortId,
            scenario.id,
            `${scenario.title} (${c + 1}.${a + 1})`,
            opens,
            due,
            null,
            1,
            instructorId,
            created,
          )
          assignmentScenario.set(id, scenario.id)
          result.assignmentScenarios[id] = scenario.id
          ids.push(id)
        }
        result.assignments.push(ids)
      }
      for (let i = 0; i < shape.apprentices; i++) {
        const id = randomUUID()
        const email = `apprentice${String(i + 1).padStart(3, '0')}@${BENCH_DOMAIN}`
        const cohortId = result.cohorts[i % shape.cohorts]!
        insertUser.run(
          id,
          email,
          `Apprentice ${String(i + 1).padStart(3, '0')}`,
          'apprentice',
          hash,
          1,
          0,
          created,
          created,
          null,
        )
        insertEnrollment.run(randomUUID(), cohortId, id, created)
        result.apprentices.push({ id, email, cohortId })
      }
      for (let n = 0; n < shape.attempts; n++) {
        const who = result.apprentices[Math.floor(random() * result.apprentices.length)]!
        const cohortIndex = result.cohorts.indexOf(who.cohortId)
        const assignmentId =
          result.assignments[cohortIndex]![Math.floor(random() * shape.assignmentsPerCohort)]!
        const scenarioId = assignmentScenario.get(assignmentId)!
        const options = graded.get(scenarioId)!
        const pick = options[Math.floor(random() * options.length)]!
        const at = now - Math.floor(random() * 30 * 86_400_000)
        const draft = random() < 0.1
        const g = pick.grade
        insertAttempt.run(
          randomUUID(), who.id, assignmentId, scenarioId, draft ? 'inProgress' : 'submitted', pick.events,
          pick.eventCount, 0, iso(at - 1_800_000), iso(at), draft ? null : iso(at),
          draft ? null : g.score, draft ? null : g.passed ? 1 : 0, draft ? null : g.score,
          draft ? null : g.passed ? 1 : 0, draft ? null : JSON.stringify(g.evidence), draft ? null : iso(at),
        ) // prettier-ignore
      }
    })()
    const count = async (table: string) =>
      Number((await ds.query(`SELECT COUNT(*) AS n FROM "${table}"`))[0].n)
    result.counts = {
      users: await count('users'),
      cohorts: await count('cohorts'),
      assignments: await count('assignments'),
      attempts: await count('attempts'),
    }
    result.seedMs = performance.now() - started
    return result
  } finally {
    await ds.destroy()
  }
}
