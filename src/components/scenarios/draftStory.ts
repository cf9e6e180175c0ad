// The reader's side of a draft document (which may be incomplete): what the scenario page shows for a
// key that has only a draft.
import type { ScenarioDraftDocument } from '@shared/api'

export interface DraftStory {
  story: string
  siteName: string
  machine: string
  difficulty: string
  estimatedMinutes: number | null
  learningOutcomes: string[]
  safetyNotes: string[]
}

const text = (v: unknown) => (typeof v === 'string' ? v : '')
const texts = (v: unknown) =>
  Array.isArray(v) ? v.filter((t): t is string => typeof t === 'string' && t !== '') : []

export function draftStory(document: ScenarioDraftDocument): DraftStory {
  const site = (document.site && typeof document.site === 'object' ? document.site : {}) as Record<
    string,
    unknown
  >
  return {
    story: text(document.story),
    siteName: text(site.name),
    machine: text(site.machine),
    difficulty: text(document.difficulty),
    estimatedMinutes: typeof document.estimatedMinutes === 'number' ? document.estimatedMinutes : null,
    learningOutcomes: texts(document.learningOutcomes),
    safetyNotes: texts(document.safetyNotes),
  }
}
