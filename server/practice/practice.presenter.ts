// A cohort's practice page: each scenario open or not with its practice counts, each member's practice.
import type { CohortPractice, PracticePolicy } from '@shared/api/practice'
import type { ScenarioLibraryItem } from '@shared/api/scenarios'
import { isOpenIn } from './practice-policy'

export interface PracticeAttemptFact {
  userId: string
  key: string
  status: string
  passed: boolean | number | null
  updatedAt: string
}

export function presentCohortPractice(
  cohortId: string,
  policy: PracticePolicy,
  scenarios: readonly ScenarioLibraryItem[],
  members: readonly { userId: string; name: string }[],
  attempts: readonly PracticeAttemptFact[],
): CohortPractice {
  return {
    cohortId,
    policy,
    scenarios: scenarios.map((s) => {
      const mine = attempts.filter((a) => a.key === s.key)
      return {
        key: s.key,
        title: s.title,
        difficulty: s.difficulty,
        open: isOpenIn(policy, s.key),
        attempts: mine.length,
        apprentices: new Set(mine.map((a) => a.userId)).size,
      }
    }),
    apprentices: [...members]
      .sort((a, b) => a.name.localeCompare(b.name))
      .map((m) => {
        const mine = attempts.filter((a) => a.userId === m.userId)
        const last = mine.map((a) => a.updatedAt).sort()
        return {
          userId: m.userId,
          name: m.name,
          attempts: mine.length,
          submitted: mine.filter((a) => a.status === 'submitted').length,
          passed: mine.filter((a) => Boolean(a.passed)).length,
          lastAt: last.length ? new Date(last[last.length - 1]!).toISOString() : null,
        }
      }),
  }
}
