// The safety rule: every terminal work done while energised, without a lock, or before absence of
// voltage was proved — whatever the scenario's objectives. The live grader returns each violation as
// the work happens (the panel's warning); the grade lists them all. Facts shared with the
// safe-practice objectives (energised, the lock in force, where a proof of dead must start) live here.
import type { SafetyViolation } from '../api/grading'
import { readMeter } from '../model/meter'
import { SAFE_VOLTS } from './objectiveSchema'
import { formatTime, formatVolts } from './format'
import { describeWork, probePointsName } from './names'
import { DEFAULT_DEAD_PAIRS, DeadTestWatcher, type DeadWatch } from './proofs'
import { isTerminalWorkMoment, type Sample } from './samples'

export type { SafetyViolation }

/** Why the drive was energised at a moment, or null when it was safe to touch (supply off, bus low). */
export function energised(sample: Sample, thresholdVolts = SAFE_VOLTS): string | null {
  if (sample.drive.lineOn) return 'the supply disconnect was on'
  if (sample.drive.busVolts > thresholdVolts) return `the DC bus was at ${formatVolts(sample.drive.busVolts)}`
  return null
}

/** The lock.applied that a moment falls under (the latest one before it, still in force), if any. */
export function lockInForce(sample: Sample): number | undefined {
  if (!sample.state.power.locked) return undefined
  return sample.isolation.lastLockT ?? 0 // locked from the start
}

/** Where a proof of dead must start: the lock in force, else the last switch-off (else the start). */
export function isolationStart(sample: Sample): number {
  return lockInForce(sample) ?? sample.isolation.lastOffT ?? 0
}

const NONE: readonly SafetyViolation[] = Object.freeze([])

/**
 * The meter turned to resistance or continuity with its probes across a voltage (the meter shows its
 * voltage warning): an ohmmeter injects its own test current and is only for a circuit proved dead
 * (common practice; a meter's instructions say so, and a live circuit can damage it or its user).
 * Judged just after each probe move or selector turn, so each such act is one violation.
 */
function ohmmeterOnLiveCircuit(sample: Sample): SafetyViolation[] {
  if (sample.at !== 'after') return []
  const type = sample.event?.type
  if (type !== 'meter.probes' && type !== 'meter.mode') return []
  const { mode } = sample.state.meter
  if (mode !== 'resistance' && mode !== 'continuity') return []
  const reading = readMeter(sample.state)
  if (reading.shows !== 'voltagePresent') return []
  return [
    {
      kind: 'ohmmeterOnLiveCircuit',
      t: sample.t,
      text:
        `Meter on ${mode === 'resistance' ? 'resistance' : 'continuity'} across a live circuit at ${formatTime(sample.t)}, ` +
        `probes on ${probePointsName(reading, sample.state)}: resistance and continuity are measured only on a circuit proved dead.`,
    },
  ]
}

/** The safety rule over a stream of samples. Its state only grows by the violations it finds. */
export class SafetyRule {
  readonly #watcher = new DeadTestWatcher(DEFAULT_DEAD_PAIRS, false)
  #watch: DeadWatch = this.#watcher.empty
  readonly #violations: SafetyViolation[] = []

  /** Takes the next sample; returns the violations the moment shows (none unless it is terminal work). */
  step(sample: Sample): readonly SafetyViolation[] {
    this.#watch = this.#watcher.step(this.#watch, sample)
    const found = [
      ...ohmmeterOnLiveCircuit(sample),
      ...(isTerminalWorkMoment(sample) ? this.#judge(sample) : []),
    ]
    if (found.length === 0) return NONE
    this.#violations.push(...found)
    return found
  }

  /** Every violation so far, in the order they happened. */
  get violations(): readonly SafetyViolation[] {
    return this.#violations
  }

  #judge(before: Sample): SafetyViolation[] {
    const found: SafetyViolation[] = []
    const what = describeWork(before)
    const when = formatTime(before.t)
    const live = energised(before)
    if (live)
      found.push({ kind: 'workWhileEnergised', t: before.t, text: `${what} at ${when} while ${live}.` })
    if (lockInForce(before) === undefined) {
      found.push({
        kind: 'workWithoutLock',
        t: before.t,
        text: `${what} at ${when} with no lock on the disconnect.`,
      })
    }
    const since = this.#watcher.since(this.#watch, isolationStart(before))
    if (!this.#watcher.tests(since, SAFE_VOLTS).every((d) => d.proved)) {
      found.push({
        kind: 'workWithoutProvingDead',
        t: before.t,
        text: `${what} at ${when} before absence of voltage was proved on every line pair and the DC bus.`,
      })
    }
    return found
  }
}
