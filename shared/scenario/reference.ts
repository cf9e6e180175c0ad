// How a reference solution (an author's recorded run) fares on a scenario document: what the publish gate
// and the authoring screens read. Full marks means every point earned, no hint cost and no unsafe moment.
import { ModelInputError, type AttemptEvent } from '../model'
import type { ReferenceResult } from '../api/scenarioAuthoring'
import { grade } from './grade'
import type { Scenario } from './schema'

export function referenceResult(scenario: Scenario, events: readonly AttemptEvent[]): ReferenceResult {
  let result
  try {
    result = grade(scenario, events)
  } catch (error) {
    if (!(error instanceof ModelInputError)) throw error
    const possible = scenario.objectives.reduce((sum, o) => sum + o.weight, 0)
    return {
      score: 0,
      passed: false,
      fullMarks: false,
      pointsEarned: 0,
      pointsPossible: possible,
      missed: scenario.objectives.map((o) => o.title),
      safetyViolations: 0,
      problem: `The recorded run cannot be replayed on this scenario (${error.message}). Record it again.`,
    }
  }
  const { points } = result
  const fullMarks =
    result.passed &&
    points.net === points.possible &&
    points.hintCost === 0 &&
    result.safetyViolations.length === 0
  return {
    score: result.score,
    passed: result.passed,
    fullMarks,
    pointsEarned: points.net,
    pointsPossible: points.possible,
    missed: result.objectives.filter((o) => !o.met).map((o) => o.title),
    safetyViolations: result.safetyViolations.length,
  }
}

/**
 * What keeps a result short of full marks, one phrase each ("misses 1 objective: …", "has 2 unsafe
 * moments"); empty for full marks. The server's refusal and the client's screens both word it from here.
 */
export function shortfallPhrases(result: ReferenceResult): string[] {
  if (result.fullMarks) return []
  if (result.problem) return [result.problem]
  const parts: string[] = []
  if (result.missed.length === 1) parts.push(`misses 1 objective: ${result.missed[0]}`)
  else if (result.missed.length > 1)
    parts.push(`misses ${result.missed.length} objectives: ${result.missed.join('; ')}`)
  if (result.safetyViolations === 1) parts.push('has 1 unsafe moment')
  else if (result.safetyViolations > 1) parts.push(`has ${result.safetyViolations} unsafe moments`)
  if (parts.length === 0 && result.pointsEarned < result.pointsPossible)
    parts.push(`earns ${result.pointsEarned} of ${result.pointsPossible} points (a hint was used)`)
  if (parts.length === 0) parts.push('does not pass')
  return parts
}

/** Why a result does not allow publishing, in words (null when it does). */
export function referenceShortfall(result: ReferenceResult): string | null {
  if (result.fullMarks) return null
  if (result.problem) return result.problem
  return `The reference solution ${shortfallPhrases(result).join(' and ')}.`
}
