// The scenario library's filters: words, difficulty, learning outcome and whose scenario it is. Pure, so
// the library and its tests share one reading of them.
import type { ScenarioLibraryItem, ScenarioOrigin } from '@shared/api'

export const DIFFICULTY_LABELS: Record<string, string> = {
  introductory: 'Introductory',
  intermediate: 'Intermediate',
  advanced: 'Advanced',
}
export const difficultyLabel = (difficulty: string) => DIFFICULTY_LABELS[difficulty] ?? difficulty

export const ORIGIN_LABELS: Record<ScenarioOrigin, string> = {
  centre: 'Our own',
  shipped: 'Shipped with Slipway',
}

export interface LibraryFilters {
  q: string
  difficulty: string | null
  outcome: string | null
  origin: ScenarioOrigin | null
}

export const noLibraryFilters = (): LibraryFilters => ({
  q: '',
  difficulty: null,
  outcome: null,
  origin: null,
})

export function filterLibrary(items: readonly ScenarioLibraryItem[], filters: LibraryFilters) {
  const q = filters.q.trim().toLowerCase()
  return items.filter(
    (s) =>
      (!q || `${s.title} ${s.story}`.toLowerCase().includes(q)) &&
      (!filters.difficulty || s.difficulty === filters.difficulty) &&
      (!filters.outcome || s.learningOutcomes.includes(filters.outcome)) &&
      (!filters.origin || s.origin === filters.origin),
  )
}

/** Every learning outcome in the library once, in alphabetical order (the outcome filter's choices). */
export function outcomeChoices(items: readonly ScenarioLibraryItem[]): string[] {
  return [...new Set(items.flatMap((s) => s.learningOutcomes))].sort((a, b) => a.localeCompare(b))
}
