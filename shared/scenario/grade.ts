// grade(scenario, events): replays an attempt through the model and scores it against the
// scenario's objectives. Pure and deterministic; the server calls it as the authority.
//
// Scoring rule: points = sum of the weights of the objectives met, minus the cost of each distinct
// hint revealed (never below zero). score = round(100 × points / total weight). An attempt passes when
// points ≥ passMark AND every objective marked `required` is met (the scenarios mark their safety
// objectives required, so an unsafe attempt cannot pass on points).
import { ModelInputError, type AttemptEvent } from '../model'
import { evaluate } from './evaluators'
import { formatTime } from './format'
import { SAFETY_KINDS, type ObjectiveKind } from './objectiveSchema'
import { safetyViolations, type SafetyViolation } from './safety'
import { traceAttempt } from './samples'
import type { Scenario } from './schema'
import { toSimulationSetup } from './setup'

export interface ObjectiveResult {
  id: string
  kind: ObjectiveKind
  title: string
  required: boolean
  safety: boolean
  met: boolean
  pointsEarned: number
  pointsPossible: number
  /** Plain words: the simulated time and the values that met or missed the objective. */
  evidence: string
  /** Simulated ms the evidence refers to, when it is one moment. */
  at?: number
}

export interface HintUse {
  id: string
  t: number
  cost: number
}

export interface GradeResult {
  scenarioId: string
  scenarioVersion: number
  /** 0–100. */
  score: number
  passed: boolean
  points: { earned: number; hintCost: number; net: number; possible: number; passMark: number }
  objectives: ObjectiveResult[]
  /** Unsafe moments, whatever the objectives (work on live terminals, without a lock, unproved). */
  safetyViolations: SafetyViolation[]
  hintsUsed: HintUse[]
  /** Required objectives that were missed (any one fails the attempt). */
  missedRequired: string[]
  /** Simulated ms at which the attempt was judged. */
  endedAt: number
  summary: string
}

export interface GradeOptions {
  /** Judge at this simulated time (ms) instead of the last event: the panel's live view. */
  endAt?: number
}

/**
 * A log the grader cannot replay (it should have been refused at the edge by attemptLogSchema).
 * A ModelInputError, so callers that already map the model's input errors to a 400 keep doing so.
 */
export class GradeInputError extends ModelInputError {
  constructor(message: string) {
    super(message)
    this.name = 'GradeInputError'
  }
}

function assertReplayable(events: readonly AttemptEvent[], endAt: number | undefined): void {
  let previous = 0
  events.forEach((event, index) => {
    if (!Number.isInteger(event.t) || event.t < 0) {
      throw new GradeInputError(
        `events[${index}].t must be a whole number of milliseconds ≥ 0 (got ${event.t})`,
      )
    }
    if (event.t < previous) {
      throw new GradeInputError(
        `events[${index}] at ${event.t} ms is earlier than the event before it (${previous} ms)`,
      )
    }
    previous = event.t
  })
  if (endAt !== undefined && (!Number.isInteger(endAt) || endAt < 0)) {
    throw new GradeInputError(`endAt must be a whole number of milliseconds ≥ 0 (got ${endAt})`)
  }
}

export function grade(
  scenario: Scenario,
  events: readonly AttemptEvent[],
  options: GradeOptions = {},
): GradeResult {
  assertReplayable(events, options.endAt)
  const trace = traceAttempt(toSimulationSetup(scenario), events, options.endAt)
  const context = { scenario, trace }
  const objectives: ObjectiveResult[] = scenario.objectives.map((objective) => {
    const verdict = evaluate(objective, context)
    const result: ObjectiveResult = {
      id: objective.id,
      kind: objective.kind,
      title: objective.title,
      required: objective.required ?? false,
      safety: SAFETY_KINDS.includes(objective.kind),
      met: verdict.met,
      pointsEarned: verdict.met ? objective.weight : 0,
      pointsPossible: objective.weight,
      evidence: verdict.evidence,
    }
    if (verdict.at !== undefined) result.at = verdict.at
    return result
  })

  const hintsUsed = hintsRevealed(scenario, events)
  const possible = sum(objectives.map((o) => o.pointsPossible))
  const earned = sum(objectives.map((o) => o.pointsEarned))
  const hintCost = sum(hintsUsed.map((h) => h.cost))
  const net = Math.max(0, earned - hintCost)
  const score = possible > 0 ? Math.round((100 * net) / possible) : 0
  const missedRequired = objectives.filter((o) => o.required && !o.met).map((o) => o.id)
  const passed = net >= scenario.passMark && missedRequired.length === 0
  const violations = safetyViolations(trace)

  return {
    scenarioId: scenario.id,
    scenarioVersion: scenario.version,
    score,
    passed,
    points: { earned, hintCost, net, possible, passMark: scenario.passMark },
    objectives,
    safetyViolations: violations,
    hintsUsed,
    missedRequired,
    endedAt: trace.end,
    summary: summarise(score, passed, objectives, violations, trace.end),
  }
}

/** Each known hint counts once, at its first reveal; unknown hint ids cost nothing. */
function hintsRevealed(scenario: Scenario, events: readonly AttemptEvent[]): HintUse[] {
  const used: HintUse[] = []
  for (const event of events) {
    if (event.type !== 'hint.revealed' || used.some((h) => h.id === event.hintId)) continue
    const hint = scenario.hints.find((h) => h.id === event.hintId)
    if (hint) used.push({ id: hint.id, t: event.t, cost: hint.cost })
  }
  return used
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

function sum(values: number[]): number {
  return values.reduce((a, b) => a + b, 0)
}
