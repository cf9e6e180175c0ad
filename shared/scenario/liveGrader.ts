// The incremental grader: each event is folded into running objective state as it arrives, so
// handling one more event costs the same at the end of a long attempt as at its start. The batch
// grade() is this grader fed the whole log, so live ticks and the server's grade cannot disagree.
import { faultPresent, ModelInputError, type AttemptEvent } from '../model'
import type { GradeResult, HintUse, SafetyViolation } from '../api/grading'
import { DEFAULT_ASSISTANCE_LEVEL, hintCostAt, type AssistanceLevel } from './assistance'
import { startObjective, type Folding } from './evaluators'
import { InjectionTrack, type Injection } from './injections'
import { SafetyRule } from './safety'
import { AttemptSampler, type Sample } from './samples'
import type { Scenario } from './schema'
import { scoreAttempt } from './score'
import { toSimulationSetup } from './setup'

export interface LiveGrader {
  /** Append one event (t non-decreasing). Returns the safety violations this event caused (the grader's own rule). */
  push(event: AttemptEvent): { violations: SafetyViolation[] }
  /** Equal (deep-equal) to grade(scenario, eventsSoFar, { endAt }) for every endAt ≥ last event time. */
  result(endAt?: number): GradeResult
  readonly eventCount: number
  /** Time of the last event (0 before any). */
  readonly lastEventT: number
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

export function assertEventTime(event: AttemptEvent, index: number, previousT: number): void {
  if (!Number.isInteger(event.t) || event.t < 0) {
    throw new GradeInputError(
      `events[${index}].t must be a whole number of milliseconds ≥ 0 (got ${event.t})`,
    )
  }
  if (event.t < previousT) {
    throw new GradeInputError(
      `events[${index}] at ${event.t} ms is earlier than the event before it (${previousT} ms)`,
    )
  }
}

export function assertEndAt(endAt: number | undefined): void {
  if (endAt !== undefined && (!Number.isInteger(endAt) || endAt < 0)) {
    throw new GradeInputError(`endAt must be a whole number of milliseconds ≥ 0 (got ${endAt})`)
  }
}

class IncrementalGrader implements LiveGrader {
  readonly #scenario: Scenario
  readonly #assistance: AssistanceLevel
  readonly #sampler: AttemptSampler
  readonly #objectives: Folding[]
  readonly #safety = new SafetyRule()
  readonly #hintsUsed: HintUse[] = []
  /** Faults an instructor put in (live classroom), each with its own objectives from that moment on. */
  readonly #injections: { id: string; track: InjectionTrack | undefined }[] = []
  /** The last sample stepped (the objectives compare a moment with the one before it). */
  #previous: Sample | undefined
  #eventCount = 0
  #lastEventT = 0

  constructor(scenario: Scenario, assistance: AssistanceLevel) {
    this.#scenario = scenario
    this.#assistance = assistance
    this.#sampler = new AttemptSampler(toSimulationSetup(scenario))
    const context = { scenario, start: this.#sampler.start }
    this.#objectives = scenario.objectives.map((objective) => startObjective(objective, context))
    this.#take(this.#sampler.start)
  }

  get eventCount(): number {
    return this.#eventCount
  }

  get lastEventT(): number {
    return this.#lastEventT
  }

  push(event: AttemptEvent): { violations: SafetyViolation[] } {
    assertEventTime(event, this.#eventCount, this.#lastEventT)
    const samples = this.#sampler.push(event)
    this.#eventCount++
    this.#lastEventT = event.t
    let violations: SafetyViolation[] = []
    for (const sample of samples) {
      const found = this.#take(sample)
      if (found.length > 0) violations = [...violations, ...found]
    }
    if (event.type === 'hint.revealed') this.#hintRevealed(event.hintId, event.t)
    return { violations }
  }

  result(endAt?: number): GradeResult {
    assertEndAt(endAt)
    // The moments after the last event are judged on copies: the running state stays as it was.
    const tail = this.#sampler.end(Math.max(this.#lastEventT, endAt ?? 0))
    const end = tail[tail.length - 1]!
    const verdicts = this.#objectives.map((objective) => {
      let previous = this.#previous
      for (const sample of tail) {
        objective = objective.step(sample, previous)
        previous = sample
      }
      return objective.verdict(end)
    })
    const injected = this.#injections.flatMap(({ track }) =>
      track ? track.results(tail, this.#previous, end) : [],
    )
    return scoreAttempt(
      this.#scenario,
      verdicts,
      [...this.#safety.violations],
      [...this.#hintsUsed],
      end.t,
      injected,
    )
  }

  #take(sample: Sample): readonly SafetyViolation[] {
    const objectives = this.#objectives
    const previous = this.#previous
    for (let i = 0; i < objectives.length; i++) objectives[i] = objectives[i]!.step(sample, previous)
    this.#previous = sample
    const violations = this.#safety.step(sample)
    for (const { track } of this.#injections) track?.step(sample, previous, violations)
    if (sample.at === 'after' && sample.event?.type === 'fault.injected')
      this.#injected(sample.event, sample, previous)
    return violations
  }

  /**
   * An instructor's fault: its objectives start at this moment. One that changed nothing (the part was
   * gone, or already faulted) gets none; the same injection sent twice counts once.
   */
  #injected(event: Injection, sample: Sample, previous: Sample | undefined): void {
    if (this.#injections.some((i) => i.id === event.injectionId)) return
    if (!faultPresent(sample.state, event.fault)) {
      this.#injections.push({ id: event.injectionId, track: undefined })
      return
    }
    const index = this.#injections.filter((i) => i.track).length
    const track = new InjectionTrack(this.#scenario, event, index, sample)
    track.step(sample, previous, [])
    this.#injections.push({ id: event.injectionId, track })
  }

  /** Each known hint counts once, at its first reveal, at its cost at this level; unknown hint ids cost nothing. */
  #hintRevealed(id: string, t: number): void {
    if (this.#hintsUsed.some((h) => h.id === id)) return
    const hint = this.#scenario.hints.find((h) => h.id === id)
    if (hint)
      this.#hintsUsed.push({ id: hint.id, t, cost: hintCostAt(this.#assistance, hint.cost), text: hint.text })
  }
}

export interface LiveGraderOptions {
  /** The attempt's assistance level (default standard): guided hints cost nothing. */
  assistance?: AssistanceLevel
}

export function createLiveGrader(
  scenario: Scenario,
  initial: readonly AttemptEvent[] = [],
  options: LiveGraderOptions = {},
): LiveGrader {
  const grader = new IncrementalGrader(scenario, options.assistance ?? DEFAULT_ASSISTANCE_LEVEL)
  for (const event of initial) grader.push(event)
  return grader
}
