// The reference solution and the publish gate in words, for the draft card, the versions list and the
// pack upload's results. Objective titles are the author's own words; nothing else reaches the screen.
import type { ReferenceResult, ScenarioDraft } from '@shared/api'
import { shortfallPhrases } from '@shared/scenario/reference'

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`

/** How a reference solution fares on a document: "full marks", "scores 80 of 100; misses 1 objective: …". */
export function referenceResultWords(result: ReferenceResult | null | undefined): string {
  if (!result) return 'not graded'
  if (result.problem) return `cannot be replayed: ${result.problem}`
  if (result.fullMarks) return 'full marks'
  return [`scores ${Math.round(result.score)} of 100`, ...shortfallPhrases(result)].join('; ')
}

/** Why "Publish" is refused now, in words; null when the draft can be published. */
export function publishBlockedReason(draft: ScenarioDraft): string | null {
  if (draft.publishable) return null
  if (draft.problems.length)
    return `Put right the ${plural(draft.problems.length, 'problem')} listed above first.`
  if (!draft.reference) return 'Record the reference solution first: a version must be shown to be passable.'
  if (!draft.reference.result) return 'The reference solution is graded once the draft passes every check.'
  if (!draft.reference.result.fullMarks)
    return `The reference solution must score full marks; it ${referenceResultWords(draft.reference.result)}. Record it again.`
  return 'The server does not allow publishing this draft yet.'
}
