// Live classroom: each fault an instructor puts into a running attempt brings its own objectives, graded on
// method as a troubleshooting scenario's are (the same evaluators, started at the injection): put right
// safely, diagnosed, found by measurement. A log without injections grades exactly as before.
import type { ObjectiveResult, SafetyViolation } from '../api/grading'
import { faultPresent, type AttemptEvent, type InjectedFault } from '../model'
import { startObjective, type Folding, type Verdict } from './evaluators'
import { formatTime, joinTexts } from './format'
import { faultName } from './names'
import type { Objective } from './objectiveSchema'
import type { Sample } from './samples'
import type { Scenario } from './schema'

export type Injection = Extract<AttemptEvent, { type: 'fault.injected' }>

/**
 * Points of each injection's objectives (ours): putting the fault right safely counts as much as finding
 * it by method (a right diagnosis and a telling measurement). A setting has no meter reading that tells
 * it apart (it is read on the keypad), so its diagnosis carries the method's share alone.
 */
export const INJECTION_POINTS = { cleared: 10, diagnosis: 5, measurement: 5 } as const

const ORDINALS = ['', 'second ', 'third ', 'fourth ', 'fifth ']

/** What the live panel shows: never the fault itself. */
export function injectionTitle(index: number, what: string): string {
  const ordinal = ORDINALS[index] ?? `${index + 1}th `
  return `The ${ordinal}fault your instructor put in: ${what}`
}

interface Part {
  suffix: 'cleared' | 'diagnosis' | 'measurement'
  objective: Objective
  folding: Folding
}

/** Safety violations that count against a repair: terminal work unsafe while the fault was being put right. */
const WORK_KINDS: readonly SafetyViolation['kind'][] = [
  'workWhileEnergised',
  'workWithoutLock',
  'workWithoutProvingDead',
]

/**
 * One injection's objectives, stepped with every sample from the injection on. Its evaluators see the
 * scenario with the injected fault appended to its faults, as if it had been there from the start.
 */
export class InjectionTrack {
  readonly #event: Injection
  readonly #index: number
  readonly #parts: Part[]
  readonly #name: string
  /** Unsafe terminal work from the injection until the repair was finished. */
  #unsafe: SafetyViolation[] = []
  /** The repair is finished: the fault gone and the bench switched back on. */
  #closed = false

  constructor(scenario: Scenario, event: Injection, index: number, start: Sample) {
    this.#event = event
    this.#index = index
    this.#name = faultName(event.fault, start.state)
    const faults = [...scenario.faults, event.fault]
    const context = { scenario: { ...scenario, faults }, start }
    const fault = scenario.faults.length
    this.#parts = objectivesFor(event.fault, index, fault).map(({ suffix, objective }) => ({
      suffix,
      objective,
      folding: startObjective(objective, context),
    }))
  }

  get fault(): InjectedFault {
    return this.#event.fault
  }

  step(sample: Sample, previous: Sample | undefined, violations: readonly SafetyViolation[]): void {
    for (const part of this.#parts) part.folding = part.folding.step(sample, previous)
    if (this.#closed) return
    // The repair's work runs until the bench is switched back on with the fault gone (a broken wire is
    // gone when it is taken off, but its replacement is fitted after): all of it must be done isolated.
    const unsafe = violations.filter((v) => WORK_KINDS.includes(v.kind))
    if (unsafe.length > 0) this.#unsafe = [...this.#unsafe, ...unsafe]
    // A setting is put right on the keypad: no terminal work, so the repair ends when it is saved back.
    const { fault } = this.#event
    const restored = sample.at === 'after' && !faultPresent(sample.state, fault)
    if (restored && (fault.kind === 'settingChanged' || sample.event?.type === 'power.on'))
      this.#closed = true
  }

  /** The results as if the attempt ended at `end`, after stepping `tail` on copies. */
  results(tail: readonly Sample[], previous: Sample | undefined, end: Sample): ObjectiveResult[] {
    return this.#parts.map((part) => {
      let folding = part.folding
      let before = previous
      for (const sample of tail) {
        folding = folding.step(sample, before)
        before = sample
      }
      const verdict = this.#withSafety(part, folding.verdict(end))
      return this.#result(part, verdict)
    })
  }

  #withSafety(part: Part, verdict: Verdict): Verdict {
    if (part.suffix !== 'cleared' || !verdict.met || this.#unsafe.length === 0) return verdict
    const texts = this.#unsafe.map((v) => v.text)
    return {
      met: false,
      evidence: `${verdict.evidence} The work was not done under safe isolation: ${joinTexts(texts)}`,
      at: this.#unsafe[0]!.t,
    }
  }

  #result(part: Part, verdict: Verdict): ObjectiveResult {
    const { objective } = part
    const { by, t } = this.#event
    const result: ObjectiveResult = {
      id: objective.id,
      kind: objective.kind,
      title: objective.title,
      required: false,
      safety: false,
      met: verdict.met,
      pointsEarned: verdict.met
        ? objective.weight
        : Math.max(0, Math.min(objective.weight, verdict.points ?? 0)),
      pointsPossible: objective.weight,
      evidence: `${by.name} put in ${this.#name} at ${formatTime(t)}. ${verdict.evidence}`,
      injection: { id: this.#event.injectionId, index: this.#index, at: t, by: by.name },
    }
    if (verdict.at !== undefined) result.at = verdict.at
    return result
  }
}

function objectivesFor(
  fault: InjectedFault,
  index: number,
  faultIndex: number,
): { suffix: Part['suffix']; objective: Objective }[] {
  const id = (suffix: string) => `injected${index + 1}-${suffix}`
  const measured = fault.kind !== 'settingChanged'
  const diagnosisWeight = measured
    ? INJECTION_POINTS.diagnosis
    : INJECTION_POINTS.diagnosis + INJECTION_POINTS.measurement
  const parts: { suffix: Part['suffix']; objective: Objective }[] = [
    {
      suffix: 'cleared',
      objective: {
        id: id('cleared'),
        kind: 'faultFoundAndCleared',
        title: injectionTitle(index, 'put right, working safely'),
        weight: INJECTION_POINTS.cleared,
        fault: faultIndex,
      },
    },
    {
      suffix: 'diagnosis',
      objective: {
        id: id('diagnosis'),
        kind: 'diagnosisCorrect',
        title: injectionTitle(index, 'diagnosed correctly'),
        weight: diagnosisWeight,
        fault: faultIndex,
      },
    },
  ]
  if (measured) {
    parts.push({
      suffix: 'measurement',
      objective: {
        id: id('measurement'),
        kind: 'discriminatingMeasurement',
        title: injectionTitle(index, 'found by measurement'),
        weight: INJECTION_POINTS.measurement,
        fault: faultIndex,
      },
    })
  }
  return parts
}
