// The reference solution's grade on a draft, kept on the draft row beside a fingerprint of what was graded
// (the checked document and the run), so reading drafts (the list above all) grades only what changed since.
// Publishing never reads it: the gate grades again (drafts.service.ts publishDraft).
import { createHash } from 'node:crypto'
import type { EntityManager } from 'typeorm'
import type { ReferenceResult } from '@shared/api/scenarioAuthoring'
import type { Scenario } from '@shared/scenario/schema'
import type { AppContext } from '../context'
import { ScenarioDraftEntity, type ScenarioDraftRow } from '../entities'

type Db = AppContext['dataSource'] | EntityManager

/** Raise when the grading rules change, so every kept grade is graded again on its next read. */
const GRADING_REVISION = 1

export interface ReferenceGrade {
  fingerprint: string
  result: ReferenceResult
}

/** What a grade depends on: the document as graded and the run's events. */
export function referenceFingerprint(documentJson: string, eventsJson: string): string {
  return createHash('sha256')
    .update(`${GRADING_REVISION}\n`)
    .update(documentJson)
    .update('\0')
    .update(eventsJson)
    .digest('hex')
}

/** Grades the run on the document in the grading pool (never from what is kept). */
export async function gradeReference(
  ctx: AppContext,
  scenario: Scenario,
  eventsJson: string,
): Promise<ReferenceGrade> {
  const documentJson = JSON.stringify(scenario)
  const result = await ctx.grading.reference(documentJson, eventsJson)
  return { fingerprint: referenceFingerprint(documentJson, eventsJson), result }
}

/**
 * Stores a grade on the draft of a key. A save racing with it is harmless: the fingerprint kept is that of
 * what was graded, so the newer document does not match it and is graded on its next read.
 */
export async function keepReferenceGrade(db: Db, key: string, grade: ReferenceGrade): Promise<void> {
  await db
    .getRepository(ScenarioDraftEntity)
    .update(
      { key },
      { referenceFingerprint: grade.fingerprint, referenceResult: JSON.stringify(grade.result) },
    )
}

/** The kept grade when it is of this document and run; otherwise graded now and kept. */
export async function draftReferenceResult(
  ctx: AppContext,
  draft: ScenarioDraftRow,
  scenario: Scenario,
  eventsJson: string,
): Promise<ReferenceResult> {
  const kept = draft.referenceResult
  if (kept && draft.referenceFingerprint === referenceFingerprint(JSON.stringify(scenario), eventsJson))
    return JSON.parse(kept) as ReferenceResult
  const grade = await gradeReference(ctx, scenario, eventsJson)
  await keepReferenceGrade(ctx.dataSource, draft.key, grade)
  return grade.result
}
