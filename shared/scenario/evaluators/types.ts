// What an objective evaluator is: a fold over the attempt's samples, one sample at a time.
// Its state is never changed in place, so the live grader can judge "as if the attempt ended now"
// from the running state without disturbing it.
import type { ObjectiveKind, ObjectiveOf } from '../objectiveSchema'
import type { Sample } from '../samples'
import type { Scenario } from '../schema'

export interface Verdict {
  met: boolean
  /** Plain words: the simulated time and the values that met or missed the objective. */
  evidence: string
  /** Simulated time (ms) the evidence refers to, when there is one moment. */
  at?: number
  /** Points earned when not all or nothing (noNeedlessReplacements); else met earns the weight. */
  points?: number
}

/** An objective's running judgement: step it with each sample; ask for the verdict at any point. */
export interface Folding {
  /**
   * The judgement after one more sample (this same object when the sample changes nothing).
   * `previous` is the sample stepped before it (none for the first).
   */
  step(sample: Sample, previous: Sample | undefined): Folding
  /** The verdict if the attempt ended at `end`, the last sample stepped. */
  verdict(end: Sample): Verdict
}

export interface EvaluationContext {
  scenario: Scenario
  /** The first sample (the starting state). */
  start: Sample
}

export type Evaluator<K extends ObjectiveKind> = (
  objective: ObjectiveOf<K>,
  context: EvaluationContext,
) => Folding

/** A Folding from a state, a pure step and a verdict. */
export function folding<S>(
  state: S,
  step: (state: S, sample: Sample, previous: Sample | undefined) => S,
  verdict: (state: S, end: Sample) => Verdict,
): Folding {
  return new StateFolding({ step, verdict }, state)
}

// One object per state and no closures per step: a long attempt takes thousands of steps.
class StateFolding<S> implements Folding {
  constructor(
    readonly rules: {
      step: (state: S, sample: Sample, previous: Sample | undefined) => S
      verdict: (state: S, end: Sample) => Verdict
    },
    readonly state: S,
  ) {}

  step(sample: Sample, previous: Sample | undefined): Folding {
    const next = this.rules.step(this.state, sample, previous)
    return next === this.state ? this : new StateFolding(this.rules, next)
  }

  verdict(end: Sample): Verdict {
    return this.rules.verdict(this.state, end)
  }
}

/** A Folding whose verdict is fixed whatever happens (an objective the scenario cannot judge). */
export function fixed(verdict: Verdict): Folding {
  const self: Folding = { step: () => self, verdict: () => verdict }
  return self
}
