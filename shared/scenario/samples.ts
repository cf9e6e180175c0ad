// Replays an attempt through the model and keeps the moments grading looks at: each event's time
// (just before and just after it applies) and the model's breakpoints in between (a ramp reaching
// its target, a trip, standstill …). Between two samples everything is closed form, so nothing is
// sampled per millisecond.
import {
  advance,
  readCircuit,
  readDrive,
  replay,
  sameDriveReading,
  type AttemptEvent,
  type CircuitReading,
  type DriveReading,
  type SimState,
  type SimulationSetup,
} from '../model'

export type SampleAt = 'start' | 'before' | 'after' | 'breakpoint' | 'end'

export interface Sample {
  readonly t: number
  readonly at: SampleAt
  /** Index of the event this sample belongs to ('before'/'after'); -1 otherwise. */
  readonly eventIndex: number
  /** How many events the state has had applied (events[0 … applied − 1]). */
  readonly applied: number
  readonly state: SimState
  /** The drive reading of `state`. */
  readonly drive: DriveReading
}

export interface AttemptTrace {
  setup: SimulationSetup
  events: readonly AttemptEvent[]
  samples: Sample[]
  /** Time the attempt is judged at: the end marker, the last event, or a later `endAt`. */
  end: number
  /** The circuit reading of a sample (solved once, on demand). */
  circuit(sample: Sample): CircuitReading
  /** The exact model state at any time from 0 to `end`, from the nearest sample at or before it. */
  stateAt(t: number): Sample
  /** The sample just before events[eventIndex] applies. */
  before(eventIndex: number): Sample
}

/**
 * A sample that reads the drive on first use: most evaluators look at a few moments, and a long log
 * has thousands. A sample whose state reads the same as the sample before it (a meter probe moved,
 * a setting edited but not saved) shares that sample's reading instead of making an equal one.
 */
class TraceSample implements Sample {
  readonly t: number
  #drive: DriveReading | undefined
  /** The earlier sample whose reading this one shares (never itself sharing), if any. */
  readonly #readsAs: TraceSample | undefined

  constructor(
    readonly state: SimState,
    readonly at: SampleAt,
    readonly eventIndex: number,
    readonly applied: number,
    previous?: TraceSample,
  ) {
    this.t = state.t
    if (previous && sameDriveReading(previous.state, state)) this.#readsAs = previous.#readsAs ?? previous
  }

  get drive(): DriveReading {
    return (this.#drive ??= this.#readsAs ? this.#readsAs.drive : readDrive(this.state))
  }
}

/**
 * The samples of an attempt, in time order, and the sample just before each event. Kept apart from
 * traceAttempt so that the replay's timeline is garbage once the samples are taken.
 */
function sampleAttempt(
  setup: SimulationSetup,
  events: readonly AttemptEvent[],
  end: number,
): { samples: TraceSample[]; beforeEvent: TraceSample[] } {
  // The model's own replay gives the state after each event and where its closed-form pieces end.
  const timeline = replay(setup, events)
  const breakpoints = timeline.breakpoints.map((b) => Math.ceil(b.t)).sort((a, b) => a - b)
  let next = 0
  const samples: TraceSample[] = []
  const beforeEvent: TraceSample[] = []
  let state = timeline.segments[0].state
  const push = (at: SampleAt, eventIndex: number, applied: number) => {
    const sample = new TraceSample(state, at, eventIndex, applied, samples[samples.length - 1])
    samples.push(sample)
    return sample
  }
  push('start', -1, 0)

  let applied = 0
  const advanceTo = (t: number) => {
    while (next < breakpoints.length && breakpoints[next] <= t) {
      const bt = breakpoints[next++]
      if (bt > state.t && bt < t) {
        state = advance(state, bt - state.t)
        push('breakpoint', -1, applied)
      }
    }
    if (t > state.t) state = advance(state, t - state.t)
  }

  events.forEach((event, index) => {
    advanceTo(event.t)
    beforeEvent.push(push('before', index, index))
    state = timeline.segments[index + 1].state
    applied = index + 1
    push('after', index, applied)
  })
  advanceTo(end)
  push('end', -1, applied)
  return { samples, beforeEvent }
}

export function traceAttempt(
  setup: SimulationSetup,
  events: readonly AttemptEvent[],
  endAt?: number,
): AttemptTrace {
  const lastEventT = events.length > 0 ? events[events.length - 1].t : 0
  const end = Math.max(lastEventT, endAt ?? 0)
  const { samples, beforeEvent } = sampleAttempt(setup, events, end)

  const circuits = new WeakMap<SimState, CircuitReading>()
  const circuit = (sample: Sample) => {
    let reading = circuits.get(sample.state)
    if (!reading) {
      reading = readCircuit(sample.state)
      circuits.set(sample.state, reading)
    }
    return reading
  }

  const stateAt = (t: number): Sample => {
    // The last sample at or before t (the first one when t is before them all).
    const base = samples[Math.max(0, firstSampleFrom(samples, t, true) - 1)]
    if (base.t === t) return base
    return new TraceSample(advance(base.state, Math.round(t) - base.t), 'end', -1, base.applied)
  }

  const before = (eventIndex: number): Sample => beforeEvent[eventIndex]

  return { setup, events, samples, end, circuit, stateAt, before }
}

/**
 * Index of the first of some time-ordered samples at or after t (strictly after t with `afterT`), or
 * their length when there is none: windows of time are found by binary search, not by a scan.
 */
export function firstSampleFrom(samples: readonly Sample[], t: number, afterT = false): number {
  let lo = 0
  let hi = samples.length
  while (lo < hi) {
    const mid = (lo + hi) >> 1
    if (samples[mid].t < t || (afterT && samples[mid].t === t)) lo = mid + 1
    else hi = mid
  }
  return lo
}

/** Drive output on and not stopping: the motor is being driven at its reference. */
export function isRunning(drive: DriveReading): boolean {
  return (
    drive.outputOn &&
    (drive.control === 'accelerating' || drive.control === 'atSpeed' || drive.control === 'decelerating')
  )
}

/** Events that mean hands on terminals: wiring, fitting a contact block, changing a fuse. */
export function isTerminalWork(event: AttemptEvent): boolean {
  return (
    event.type === 'wire.added' ||
    event.type === 'wire.removed' ||
    event.type === 'device.contactFitted' ||
    event.type === 'fuse.replaced' ||
    event.type === 'motor.conductorLanded' ||
    event.type === 'motor.cableReplaced'
  )
}
