// Proving dead, followed sample by sample: the lowest meter reading on each probe pair since a
// moment (the last lock, the last switch-off, the start), and the meter's proofs on a known live
// source. The safety rule and the absenceOfVoltageProved objective both keep one of these.
// A reading counts for a pair only on the voltage range that shows what the pair could carry
// (`voltageRangeFor`: V AC on a line pair, V DC on the bus): V DC across a live line reads about 0 V,
// so a reading on the wrong range proves nothing.
import { voltageRangeFor, type MeterMode, type SimState } from '../model'
import type { Sample } from './samples'

/**
 * A meter reading of at least this many volts shows the meter works on a known live source. Our own
 * choice (not from a standard): above any residual reading, below the 24 V control supply, so either
 * the line or the control supply proves the meter. Common practice is a dedicated proving unit.
 */
export const PROVING_VOLTS = 20

export type ProbePair = readonly [string, string]

export const DEFAULT_DEAD_PAIRS: readonly ProbePair[] = [
  ['drive.l1', 'drive.l2'],
  ['drive.l2', 'drive.l3'],
  ['drive.l1', 'drive.l3'],
  ['drive.dcp', 'drive.dcn'],
]

export interface Reading {
  /** Magnitude (V). */
  readonly volts: number
  readonly t: number
}

/** The readings since one moment (samples at or after its millisecond). */
export interface ReadingsSince {
  readonly from: number
  /** Lowest |reading| on each pair (first of equals), in the order of the pairs. */
  readonly lowest: readonly (Reading | undefined)[]
  /** When a pair's lowest reading last went down: the end of the dead test so far. */
  readonly lastDeadT: number | undefined
  /** The first proof of the meter at or after `lastDeadT` (kept only when proofs are watched). */
  readonly proofAfterDead: Reading | undefined
}

export interface DeadWatch {
  /** The readings of the last millisecond that had any: what a lock or switch-off then counts from. */
  readonly now: ReadingsSince
  readonly sinceStart: ReadingsSince
  readonly sinceLock: ReadingsSince | undefined
  readonly sinceOff: ReadingsSince | undefined
  /** The first proof of the meter in the attempt, and the first in the last millisecond that had one. */
  readonly firstProof: Reading | undefined
  readonly nowFirstProof: Reading | undefined
}

export interface DeadTest {
  pair: ProbePair
  lowest: Reading | undefined
  proved: boolean
}

function onPair({ red, black }: SimState['meter'], pair: ProbePair): boolean {
  return (red === pair[0] && black === pair[1]) || (red === pair[1] && black === pair[0])
}

/** The meter is on the pair and set to the range a dead test of that pair must be made on. */
function testsPair(meter: SimState['meter'], pair: ProbePair, range: MeterMode): boolean {
  return meter.mode === range && onPair(meter, pair)
}

function meterVolts(sample: Sample): number | null {
  const { red, black } = sample.state.meter
  // A lifted probe reads nothing: no need to solve the circuit to know it.
  if (red === null || black === null) return null
  return sample.circuit.meter.volts
}

const NOT_MEASURED: readonly number[] = []

/** Watches the meter for proving dead on some pairs; with `proofs`, also for proofs on a live source. */
export class DeadTestWatcher {
  /** The watch before any sample. */
  readonly empty: DeadWatch
  /** The range each pair's dead test must be made on. */
  readonly #ranges: readonly MeterMode[]

  constructor(
    readonly pairs: readonly ProbePair[],
    readonly proofs: boolean,
  ) {
    this.#ranges = pairs.map(([red, black]) => voltageRangeFor(red, black))
    this.empty = {
      now: this.#fresh(-1),
      sinceStart: this.#fresh(0),
      sinceLock: undefined,
      sinceOff: undefined,
      firstProof: undefined,
      nowFirstProof: undefined,
    }
  }

  #fresh(from: number): ReadingsSince {
    return { from, lowest: this.pairs.map(() => undefined), lastDeadT: undefined, proofAfterDead: undefined }
  }

  /** The watch after one more sample (the same object when the sample changes nothing). */
  step(watch: DeadWatch, sample: Sample): DeadWatch {
    const { t, state } = sample
    // Each pair's reading, if the meter is on it on the pair's range.
    let readings: (number | null)[] | undefined
    const measured = this.#pairsMeasured(state.meter)
    for (const k of measured) {
      const volts = sample.circuit.meter.volts
      if (volts === null) continue
      readings ??= this.pairs.map(() => null)
      readings[k] = Math.abs(volts)
    }
    // The first proof of this millisecond is looked for until found (and any proof while one is awaited).
    let nowFirstProof = watch.nowFirstProof?.t === t ? watch.nowFirstProof : undefined
    let proof: Reading | undefined
    if (this.proofs && (!watch.firstProof || !nowFirstProof || awaitsProof(watch))) {
      const volts = meterVolts(sample)
      if (volts !== null && Math.abs(volts) >= PROVING_VOLTS) proof = { t, volts: Math.abs(volts) }
    }
    const locks = sample.at === 'after' && sample.event?.type === 'lock.applied'
    const switchesOff = sample.at === 'after' && sample.event?.type === 'power.off'
    if (!readings && !proof && !locks && !switchesOff) return watch

    nowFirstProof ??= proof
    const update = (since: ReadingsSince): ReadingsSince =>
      this.#update(since, t, readings, proof, nowFirstProof)
    const now = update(watch.now.from === t ? watch.now : this.#fresh(t))
    return {
      now,
      sinceStart: update(watch.sinceStart),
      // A lock or switch-off counts from its own millisecond: readings at that moment before it count too.
      sinceLock: locks ? now : watch.sinceLock && update(watch.sinceLock),
      sinceOff: switchesOff ? now : watch.sinceOff && update(watch.sinceOff),
      firstProof: watch.firstProof ?? proof,
      nowFirstProof,
    }
  }

  // Most samples share the meter placement of the sample before: look at each placement once.
  #meter: SimState['meter'] | undefined
  #measured: readonly number[] = []

  /** Indices of the pairs the meter is on, set to the pair's range. */
  #pairsMeasured(meter: SimState['meter']): readonly number[] {
    if (meter !== this.#meter) {
      this.#meter = meter
      let measured: number[] | undefined
      for (let k = 0; k < this.pairs.length; k++)
        if (testsPair(meter, this.pairs[k]!, this.#ranges[k]!)) (measured ??= []).push(k)
      this.#measured = measured ?? NOT_MEASURED
    }
    return this.#measured
  }

  #update(
    since: ReadingsSince,
    t: number,
    readings: readonly (number | null)[] | undefined,
    proof: Reading | undefined,
    nowFirstProof: Reading | undefined,
  ): ReadingsSince {
    let lowest = since.lowest
    if (readings) {
      for (let k = 0; k < readings.length; k++) {
        const volts = readings[k]
        const known = lowest[k]
        if (volts === null || volts === undefined || (known !== undefined && volts >= known.volts)) continue
        if (lowest === since.lowest) lowest = [...lowest]
        ;(lowest as (Reading | undefined)[])[k] = { volts, t }
      }
    }
    // A lower reading moves the end of the dead test to now: a proof after it must come from now on.
    if (lowest !== since.lowest) {
      return { ...since, lowest, lastDeadT: t, proofAfterDead: this.proofs ? nowFirstProof : undefined }
    }
    if (proof && since.lastDeadT !== undefined && since.proofAfterDead === undefined) {
      return { ...since, proofAfterDead: proof }
    }
    return since
  }

  /** The readings since an isolation start (one of: the start, the last lock, the last switch-off). */
  since(watch: DeadWatch, from: number): ReadingsSince {
    for (const since of [watch.sinceLock, watch.sinceOff, watch.sinceStart]) {
      if (since?.from === from) return since
    }
    throw new Error(
      `No readings kept since ${from} ms: the isolation start is not a lock, switch-off or the start`,
    )
  }

  /** Each pair's dead test since a moment: proved when its lowest reading is below the threshold. */
  tests(since: ReadingsSince, thresholdVolts: number): DeadTest[] {
    return this.pairs.map((pair, k) => {
      const lowest = since.lowest[k]
      return { pair, lowest, proved: lowest !== undefined && lowest.volts < thresholdVolts }
    })
  }
}

/** Whether some readings still wait for a proof after their dead test. */
function awaitsProof(watch: DeadWatch): boolean {
  return [watch.sinceStart, watch.sinceLock, watch.sinceOff].some(
    (since) => since?.lastDeadT !== undefined && since.proofAfterDead === undefined,
  )
}
