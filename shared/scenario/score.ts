// The scoring rule: points = sum of the weights of the objectives met (the scenario's and those of each
// fault an instructor put in, injections.ts), minus the cost of each distinct hint revealed (never below
// zero). score = round(100 × points / total weight). An attempt
// passes when points ≥ passMark AND every objective marked `required` is met (the scenarios mark
// their safety objectives required, so an unsafe attempt cannot pass on points).
import type { GradeResult, HintUse, ObjectiveResult, SafetyViolation } from '../api/grading'
import type { Verdict } from './evaluators'
import { formatTime } from './format'
import { SAFETY_KINDS } from './objectiveSchema'
import type { Scenario } from './schema'

export function scoreAttempt(
  scenario: Scenario,
  verdicts: readonly Verdict[],
  safetyViolations: SafetyViolation[],
  hintsUsed: HintUse[],
  endedAt: number,
  injected: readonly ObjectiveResult[] = [],
): GradeResult {
  const own: ObjectiveResult[] = scenario.objectives.map((objective, i) => {
    const verdict = verdicts[i]!
    const result: ObjectiveResult = {
      id: objective.id,
      kind: objective.kind,
      title: objective.title,
      required: objective.required ?? false,
      safety: SAFETY_KINDS.includes(objective.kind),
      met: verdict.met,
      pointsEarned: verdict.met
        ? objective.weight
        : Math.max(0, Math.min(objective.weight, verdict.points ?? 0)),
      pointsPossible: objective.weight,
      evidence: verdict.evidence,
    }
    if (verdict.at !== undefined) result.at = verdict.at
    return result
  })
  const objectives = [...own, ...injected]
  const possible = sum(objectives.map((o) => o.pointsPossible))
  const passMark = scaledPassMark(scenario.passMark, sum(own.map((o) => o.pointsPossible)), possible)
  const earned = sum(objectives.map((o) => o.pointsEarned))
  const hintCost = sum(hintsUsed.map((h) => h.cost))
  const net = Math.max(0, earned - hintCost)
  const score = possible > 0 ? Math.round((100 * net) / possible) : 0
  const missedRequired = objectives.filter((o) => o.required && !o.met).map((o) => o.id)
  const passed = net >= passMark && missedRequired.length === 0
  return {
    scenarioId: scenario.id,
    scenarioVersion: scenario.version,
    score,
    passed,
    points: { earned, hintCost, net, possible, passMark },
    objectives,
    safetyViolations,
    hintsUsed,
    missedRequired,
    endedAt,
    summary: summarise(score, passed, objectives, safetyViolations, endedAt),
  }
}

function summarise(
  score: number,
  passed: boolean,
  objectives: ObjectiveResult[],
  violations: SafetyViolation[],
  end: number,
): string {
  const met = objectives.filter((o) => o.met).length
  const verdict = passed ? 'Passed' : 'Not passed'
  const safety = violations.length === 0 ? 'no safety violations' : `${violations.length} safety violation(s)`
  return `${verdict}: ${score}/100, ${met} of ${objectives.length} objectives met, ${safety}, finished at ${formatTime(end)}.`
}

/**
 * Faults an instructor put in add their points to the total, and the pass mark grows in proportion: the
 * share of the points needed to pass stays the scenario's, and a missed injected fault counts against it
 * as any objective does. Without injections it is the scenario's pass mark exactly.
 */
function scaledPassMark(passMark: number, ownPossible: number, possible: number): number {
  if (possible === ownPossible || ownPossible === 0) return passMark
  return Math.round((passMark * possible) / ownPossible)
}

function sum(values: number[]): number {
  return values.reduce((a, b) => a + b, 0)
}
