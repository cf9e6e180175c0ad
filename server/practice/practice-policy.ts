// A cohort's practice policy as stored (cohorts.practiceKeys: a JSON array of open keys, null for every
// scenario) and the rule for an apprentice in several cohorts: a scenario is open for practice only when
// every active cohort of theirs leaves it open (an instructor closing one to assess it is not undone by
// another cohort).
import type { PracticePolicy } from '@shared/api/practice'
import type { CohortRow } from '../entities'

export function readPolicy(cohort: Pick<CohortRow, 'practiceKeys'>): PracticePolicy {
  if (cohort.practiceKeys === null || cohort.practiceKeys === undefined) return { mode: 'all' }
  const keys = JSON.parse(cohort.practiceKeys) as unknown
  return { mode: 'chosen', keys: Array.isArray(keys) ? keys.filter((k) => typeof k === 'string') : [] }
}

export const storedPolicy = (policy: PracticePolicy): string | null =>
  policy.mode === 'all' ? null : JSON.stringify([...new Set(policy.keys)].sort())

export const isOpenIn = (policy: PracticePolicy, key: string) =>
  policy.mode === 'all' || policy.keys.includes(key)

/** The first active cohort (by name) that closes `key`, or null when practice of it is open. */
export function closingCohort(
  cohorts: readonly Pick<CohortRow, 'name' | 'archived' | 'practiceKeys'>[],
  key: string,
): string | null {
  const closing = cohorts
    .filter((c) => !c.archived && !isOpenIn(readPolicy(c), key))
    .map((c) => c.name)
    .sort((a, b) => a.localeCompare(b))
  return closing[0] ?? null
}
