// Authoring (issue 17; the rules are in shared/api/scenarioAuthoring.ts): one working draft per key, kept
// even while it has problems; one reference solution per key, graded in the grading pool (the grade kept on
// the draft for reading: reference-grade.ts); publishing turns a draft that passes every check and whose
// reference solution scores full marks, graded again there and then, into the next version.
import { In, type EntityManager } from 'typeorm'
import {
  SCENARIO_DRAFT_MAX_BYTES,
  type CreateDraftRequest,
  type ScenarioDraft,
  type ScenarioDraftDocument,
  type ScenarioDraftSummary,
} from '@shared/api/scenarioAuthoring'
import type { DuplicateScenarioRequest, ScenarioDetail } from '@shared/api/scenarios'
import type { AttemptEvent } from '@shared/model'
import { checkScenario, type ScenarioProblem } from '@shared/scenario/check'
import { referenceShortfall } from '@shared/scenario/reference'
import type { Scenario } from '@shared/scenario/schema'
import type { AppContext } from '../context'
import {
  ScenarioDraftEntity,
  ScenarioEntity,
  ScenarioReferenceSolutionEntity,
  UserEntity,
  type ScenarioDraftRow,
  type UserRow,
} from '../entities'
import { HttpError, notFound } from '../http-error'
import { nowIso } from '../infrastructure/clock'
import { unreplayableLog } from '../infrastructure/grading/grading'
import { draftReferenceResult, gradeReference, keepReferenceGrade } from './reference-grade'
import { presentScenarioDetail } from './scenario.presenter'
import { latestVersion, storeScenarioVersion } from './scenarios.service'

type Db = AppContext['dataSource'] | EntityManager

/** The document as it would be published: its id is the key and its version the next one. */
export function draftDocument(
  document: ScenarioDraftDocument,
  key: string,
  nextVersion: number,
): ScenarioDraftDocument {
  return { ...document, id: key, version: nextVersion }
}

function assertDraftSize(document: ScenarioDraftDocument): void {
  if (Buffer.byteLength(JSON.stringify(document)) > SCENARIO_DRAFT_MAX_BYTES)
    throw new HttpError(
      413,
      'payload_too_large',
      `The draft is larger than ${SCENARIO_DRAFT_MAX_BYTES / 1024} KB; nothing was saved`,
    )
}

const findDraft = (db: Db, key: string) => db.getRepository(ScenarioDraftEntity).findOneBy({ key })
const findReference = (db: Db, key: string) =>
  db.getRepository(ScenarioReferenceSolutionEntity).findOneBy({ key })

async function draftOrThrow(db: Db, key: string): Promise<ScenarioDraftRow> {
  const row = await findDraft(db, key)
  if (!row) throw notFound('Draft')
  return row
}

/** The problems of a draft, in words; the checked scenario when there are none. */
function checkDraft(row: ScenarioDraftRow): { problems: ScenarioProblem[]; scenario: Scenario | null } {
  const result = checkScenario(JSON.parse(row.document))
  return result.ok
    ? { problems: [], scenario: result.scenario }
    : { problems: result.problems, scenario: null }
}

/** "The draft has 2 problems: Title: …; Objective 3 (…): …" */
function problemsInWords(problems: ScenarioProblem[]): string {
  const listed = problems
    .slice(0, 5)
    .map((p) => (p.place ? `${p.place}: ${p.message}` : p.message))
    .join('; ')
  const more = problems.length > 5 ? ` (and ${problems.length - 5} more)` : ''
  const count = problems.length === 1 ? '1 problem' : `${problems.length} problems`
  return `The draft has ${count} to put right first: ${listed}${more}.`
}

async function namesOf(db: Db, ids: (string | null)[]): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((id): id is string => id !== null))]
  const users = wanted.length
    ? await db.getRepository(UserEntity).find({ where: { id: In(wanted) }, select: { id: true, name: true } })
    : []
  return new Map(users.map((u) => [u.id, u.name]))
}

/** The newest version number of each key that has one. */
async function latestVersionNumbers(db: Db, keys: string[]): Promise<Map<string, number>> {
  if (keys.length === 0) return new Map()
  const rows = await db
    .getRepository(ScenarioEntity)
    .createQueryBuilder('s')
    .select('s.key', 'key')
    .addSelect('MAX(s.version)', 'version')
    .where('s.key IN (:...keys)', { keys })
    .groupBy('s.key')
    .getRawMany<{ key: string; version: number | string }>()
  return new Map(rows.map((r) => [r.key, Number(r.version)]))
}

/**
 * Drafts as the API gives them, read in a fixed number of queries whatever their count; each reference
 * result comes from the grade kept on the draft unless the document or the run changed (reference-grade.ts).
 */
async function presentDrafts(ctx: AppContext, rows: ScenarioDraftRow[]): Promise<ScenarioDraft[]> {
  const db = ctx.dataSource
  const keys = rows.map((r) => r.key)
  const latest = await latestVersionNumbers(db, keys)
  const solutions = keys.length
    ? await db.getRepository(ScenarioReferenceSolutionEntity).findBy({ key: In(keys) })
    : []
  const solutionOf = new Map(solutions.map((s) => [s.key, s]))
  const names = await namesOf(db, [
    ...rows.map((r) => r.updatedById),
    ...solutions.map((s) => s.recordedById),
  ])
  const nameOf = (id: string | null) => (id ? (names.get(id) ?? null) : null)
  const drafts: ScenarioDraft[] = []
  for (const row of rows) {
    const document = JSON.parse(row.document) as ScenarioDraftDocument
    const nextVersion = (latest.get(row.key) ?? 0) + 1
    const { problems, scenario } = checkDraft(row)
    const reference = solutionOf.get(row.key)
    let referenceSummary: ScenarioDraft['reference'] = null
    if (reference) {
      const events = JSON.parse(reference.events) as AttemptEvent[]
      referenceSummary = {
        recordedAt: reference.recordedAt,
        recordedByName: nameOf(reference.recordedById),
        actions: events.length,
        durationMs: events.at(-1)?.t ?? 0,
        result: scenario ? await draftReferenceResult(ctx, row, scenario, reference.events) : null,
      }
    }
    drafts.push({
      key: row.key,
      title: typeof document.title === 'string' ? document.title : '',
      document: draftDocument(document, row.key, nextVersion),
      baseVersion: row.baseVersion,
      nextVersion,
      createdAt: row.createdAt,
      updatedAt: row.updatedAt,
      updatedByName: nameOf(row.updatedById),
      problems,
      reference: referenceSummary,
      publishable: problems.length === 0 && referenceSummary?.result?.fullMarks === true,
    })
  }
  return drafts
}

async function presentDraft(ctx: AppContext, row: ScenarioDraftRow): Promise<ScenarioDraft> {
  return (await presentDrafts(ctx, [row]))[0]!
}

export async function listDrafts(ctx: AppContext): Promise<ScenarioDraftSummary[]> {
  const rows = await ctx.dataSource
    .getRepository(ScenarioDraftEntity)
    .find({ order: { updatedAt: 'DESC', key: 'ASC' } })
  return (await presentDrafts(ctx, rows)).map(
    ({ key, title, baseVersion, nextVersion, updatedAt, updatedByName, publishable }) => ({
      key,
      title,
      baseVersion,
      nextVersion,
      updatedAt,
      updatedByName,
      publishable,
    }),
  )
}

export async function getDraft(ctx: AppContext, key: string): Promise<ScenarioDraft> {
  return presentDraft(ctx, await draftOrThrow(ctx.dataSource, key))
}

/** Writes (inserts or replaces) the draft of a key, numbered as the key's next version. */
async function writeDraft(
  db: Db,
  key: string,
  document: ScenarioDraftDocument,
  userId: string,
): Promise<ScenarioDraftRow> {
  const latest = await latestVersion(db, key)
  const stored = draftDocument(document, key, (latest?.version ?? 0) + 1)
  assertDraftSize(stored)
  const existing = await findDraft(db, key)
  const now = nowIso()
  const row: ScenarioDraftRow = {
    key,
    document: JSON.stringify(stored),
    baseVersion: existing ? existing.baseVersion : (latest?.version ?? null),
    createdAt: existing?.createdAt ?? now,
    updatedAt: now,
    updatedById: userId,
  }
  await db.getRepository(ScenarioDraftEntity).save(row)
  return row
}

/** A draft of a brand-new key; the key must be free of versions and drafts. */
export async function createDraft(
  ctx: AppContext,
  user: UserRow,
  { key, document }: CreateDraftRequest,
): Promise<ScenarioDraft> {
  const row = await ctx.dataSource.transaction(async (m) => {
    if ((await latestVersion(m, key)) || (await findDraft(m, key)))
      throw new HttpError(
        409,
        'conflict',
        'A scenario or draft already uses this short name; choose another',
        {
          fields: { key: ['Already in use'] },
        },
      )
    // A solution left from an earlier, discarded draft of this key belongs to nothing now.
    await m.getRepository(ScenarioReferenceSolutionEntity).delete({ key })
    return writeDraft(m, key, document, user.id)
  })
  return presentDraft(ctx, row)
}

/** A draft started from the latest version; the existing draft when there is one. */
export async function startDraft(
  ctx: AppContext,
  user: UserRow,
  key: string,
): Promise<{ draft: ScenarioDraft; created: boolean }> {
  const { row, created } = await ctx.dataSource.transaction(async (m) => {
    const existing = await findDraft(m, key)
    if (existing) return { row: existing, created: false }
    const latest = await latestVersion(m, key)
    if (!latest) throw notFound('Scenario')
    return { row: await writeDraft(m, key, JSON.parse(latest.document), user.id), created: true }
  })
  return { draft: await presentDraft(ctx, row), created }
}

/** Saves the whole working copy of a key that exists (as a version or a draft). */
export async function saveDraft(
  ctx: AppContext,
  user: UserRow,
  key: string,
  document: ScenarioDraftDocument,
): Promise<ScenarioDraft> {
  const row = await ctx.dataSource.transaction(async (m) => {
    if (!(await latestVersion(m, key)) && !(await findDraft(m, key))) throw notFound('Scenario')
    return writeDraft(m, key, document, user.id)
  })
  return presentDraft(ctx, row)
}

export async function discardDraft(ctx: AppContext, key: string): Promise<void> {
  await ctx.dataSource.transaction(async (m) => {
    await draftOrThrow(m, key)
    await m.getRepository(ScenarioDraftEntity).delete({ key })
    // A key never published keeps nothing: its solution would belong to no scenario.
    if (!(await latestVersion(m, key))) await m.getRepository(ScenarioReferenceSolutionEntity).delete({ key })
  })
}

/** Stores the run recorded against the draft as the key's reference solution, graded on the draft. */
export async function recordReference(
  ctx: AppContext,
  user: UserRow,
  key: string,
  events: AttemptEvent[],
): Promise<ScenarioDraft> {
  const row = await draftOrThrow(ctx.dataSource, key)
  const { problems, scenario } = checkDraft(row)
  if (!scenario) throw new HttpError(409, 'draft_not_ready', problemsInWords(problems))
  const eventsJson = JSON.stringify(events)
  const grade = await gradeReference(ctx, scenario, eventsJson)
  if (grade.result.problem) throw unreplayableLog(grade.result.problem)
  await ctx.dataSource.transaction(async (m) => {
    await m.getRepository(ScenarioReferenceSolutionEntity).save({
      key,
      events: eventsJson,
      recordedAt: nowIso(),
      recordedById: user.id,
    })
    await keepReferenceGrade(m, key, grade)
  })
  return presentDraft(ctx, {
    ...row,
    referenceFingerprint: grade.fingerprint,
    referenceResult: JSON.stringify(grade.result),
  })
}

/** The draft becomes the key's next version when it passes its checks and its reference run. */
export async function publishDraft(ctx: AppContext, user: UserRow, key: string): Promise<ScenarioDetail> {
  const row = await draftOrThrow(ctx.dataSource, key)
  const { problems, scenario } = checkDraft(row)
  if (!scenario) throw new HttpError(409, 'draft_not_ready', problemsInWords(problems))
  const reference = await findReference(ctx.dataSource, key)
  if (!reference)
    throw new HttpError(
      409,
      'reference_missing',
      'Record a reference solution first: publishing needs a run that scores full marks on this draft.',
    )
  // Graded now, never taken from the grade kept for reading: what is published must have been graded.
  const { result } = await gradeReference(ctx, scenario, reference.events)
  const shortfall = referenceShortfall(result)
  if (shortfall) throw new HttpError(409, 'reference_not_full', shortfall)
  const version = await ctx.dataSource.transaction(async (m) => {
    // What was graded must be what is published: a save or a new recording in between refuses.
    const now = await findDraft(m, key)
    const solution = await findReference(m, key)
    if (now?.document !== row.document || solution?.events !== reference.events)
      throw new HttpError(409, 'conflict', 'The draft changed while it was being published; try again')
    const stored = await storeScenarioVersion(m, scenario, user.id, 'either', '', result)
    await m.getRepository(ScenarioDraftEntity).delete({ key })
    return stored.row
  })
  return presentScenarioDetail(version)
}

/** A draft of a new key from the latest version of another, with that key's reference solution. */
export async function duplicateToDraft(
  ctx: AppContext,
  user: UserRow,
  key: string,
  { newKey, title }: DuplicateScenarioRequest,
): Promise<ScenarioDraft> {
  const row = await ctx.dataSource.transaction(async (m) => {
    const source = await latestVersion(m, key)
    if (!source) throw notFound('Scenario')
    if ((await latestVersion(m, newKey)) || (await findDraft(m, newKey)))
      throw new HttpError(
        409,
        'conflict',
        'A scenario or draft already uses this short name; choose another',
        {
          fields: { newKey: ['Already in use'] },
        },
      )
    const document = JSON.parse(source.document) as ScenarioDraftDocument
    document.title = title ?? `${source.title} (copy)`.slice(0, 120)
    const solutions = m.getRepository(ScenarioReferenceSolutionEntity)
    await solutions.delete({ key: newKey })
    const solution = await solutions.findOneBy({ key })
    if (solution) await solutions.insert({ ...solution, key: newKey })
    return writeDraft(m, newKey, document, user.id)
  })
  return presentDraft(ctx, row)
}

/** Replaces the draft of a key (pack import of a scenario without a solution). */
export const replaceDraft = writeDraft
