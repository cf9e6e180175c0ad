// The moments grading looks at, produced one event at a time: each event's time (just before and
// just after it applies) and the model's breakpoints in between (a ramp reaching its target, a trip,
// standstill …), up to the moment the attempt is judged at. Between two samples everything is closed form, so nothing is sampled per millisecond.
// The live grader and the batch grade both read this one stream, so they judge the same moments.
import {
  advance,
  createSimulation,
  readCircuit,
  readDrive,
  sameDriveReading,
  type AttemptEvent,
  type BreakpointKind,
  type CircuitReading,
  type DriveReading,
  type SimState,
  type SimulationSetup,
} from '../model'
import { applyEventCollecting } from '../model/simulation'
import { advancePieces } from '../model/time'

export type SampleAt = 'start' | 'before' | 'after' | 'breakpoint' | 'end'

/** The lock and switch-off events applied so far (times), for the safe-practice rules. */
export interface IsolationEvents {
  /** Time of the last `lock.applied` applied so far. */
  readonly lastLockT: number | undefined
  /** Time of the last `power.off` applied so far. */
  readonly lastOffT: number | undefined
}

export interface Sample {
  readonly t: number
  readonly at: SampleAt
  /** Index of the event this sample belongs to ('before'/'after'); -1 otherwise. */
  readonly eventIndex: number
  /** The event this sample belongs to ('before'/'after'). */
  readonly event: AttemptEvent | undefined
  /** How many events the state has had applied (events[0 … applied − 1]). */
  readonly applied: number
  readonly state: SimState
  /** The drive reading of `state` (read on first use). */
  readonly drive: DriveReading
  /** The circuit reading of `state` (solved on first use). */
  readonly circuit: CircuitReading
  /** Whether the +24 V control supply is on (shared with the sample before when the circuit is alike). */
  readonly supplyOn: boolean
  readonly isolation: IsolationEvents
}

// Samples of one moment often share a state (an event at the same millisecond as the one before):
// solve its circuit once.
const circuits = new WeakMap<SimState, CircuitReading>()

/**
 * A sample that reads the drive on first use: most objectives look at a few moments, and a long log
 * has thousands. A sample whose state reads the same as the sample before it (a meter probe moved,
 * a setting edited but not saved) shares that sample's reading instead of making an equal one.
 */
class StreamSample implements Sample {
  readonly t: number
  #drive: DriveReading | undefined
  /** The earlier sample whose reading this one shares (never itself sharing), if any. */
  readonly #readsAs: StreamSample | undefined
  #supplyOn: boolean | undefined
  /** The earlier sample whose circuit is configured as this one's (never itself sharing), if any. */
  readonly #wiredAs: StreamSample | undefined

  constructor(
    readonly state: SimState,
    readonly at: SampleAt,
    readonly eventIndex: number,
    readonly event: AttemptEvent | undefined,
    readonly applied: number,
    readonly isolation: IsolationEvents,
    previous?: StreamSample,
  ) {
    this.t = state.t
    if (previous && sameDriveReading(previous.state, state)) this.#readsAs = previous.#readsAs ?? previous
    if (previous && sameCircuitConfig(previous.state, state)) this.#wiredAs = previous.#wiredAs ?? previous
  }

  get drive(): DriveReading {
    return (this.#drive ??= this.#readsAs ? this.#readsAs.drive : readDrive(this.state))
  }

  get circuit(): CircuitReading {
    let reading = circuits.get(this.state)
    if (!reading) {
      reading = readCircuit(this.state)
      circuits.set(this.state, reading)
    }
    return reading
  }

  get supplyOn(): boolean {
    return (this.#supplyOn ??= this.#wiredAs ? this.#wiredAs.supplyOn : this.circuit.supplyOn)
  }
}

/**
 * True when the circuit readings of both states are alike but for the meter: the circuit configured
 * alike, the same input states and the same analog input (a meter probe moved, a setting edited).
 */
export function sameCircuitButMeter(a: SimState, b: SimState): boolean {
  return sameCircuitConfig(a, b) && a.inputs === b.inputs && a.circuit === b.circuit
}

/**
 * True when the model configures the control circuit of both states alike (the parts its circuit
 * configuration reads are the same objects or values), so its solution — the supply, the inputs'
 * voltages — is the same. A meter probe moved, a setting edited but not saved, time passing.
 */
function sameCircuitConfig(a: SimState, b: SimState): boolean {
  return (
    a === b ||
    (a.wires === b.wires &&
      a.brokenWires === b.brokenWires &&
      a.devices === b.devices &&
      a.deviceOrder === b.deviceOrder &&
      a.fuseBlown === b.fuseBlown &&
      a.settings.active === b.settings.active &&
      a.bus.controlOn === b.bus.controlOn &&
      a.circuit.relayClosed === b.circuit.relayClosed)
  )
}

type Breakpoint = { t: number; what: BreakpointKind }

const NO_ISOLATION: IsolationEvents = { lastLockT: undefined, lastOffT: undefined }

/**
 * Turns an attempt into samples as its events arrive. Keeps only the state after the last event,
 * so the cost of an event does not depend on how many came before it.
 */
export class AttemptSampler {
  /** The first sample (the starting state). */
  readonly start: Sample
  #last: StreamSample
  #state: SimState
  #applied = 0
  #isolation = NO_ISOLATION

  constructor(setup: SimulationSetup) {
    this.#state = createSimulation(setup)
    this.#last = new StreamSample(this.#state, 'start', -1, undefined, 0, NO_ISOLATION)
    this.start = this.#last
  }

  /** Time of the state after the last event. */
  get t(): number {
    return this.#state.t
  }

  /** The samples an event adds, in time order: breakpoints since the event before, then before and after it. */
  push(event: AttemptEvent): Sample[] {
    const breakpoints: Breakpoint[] = []
    const next = applyEventCollecting(this.#state, event, breakpoints)
    const added: Sample[] = []
    const state = this.#passBreakpoints(breakpoints, event.t, added)
    added.push(this.#add(state, 'before', event))
    this.#applied++
    if (event.type === 'lock.applied') this.#isolation = { ...this.#isolation, lastLockT: event.t }
    if (event.type === 'power.off') this.#isolation = { ...this.#isolation, lastOffT: event.t }
    this.#state = next
    added.push(this.#add(next, 'after', event))
    return added
  }

  /**
   * The moments from the last event to `t` (≥ it): the breakpoints passed on the way, then the moment
   * the attempt is judged at. Not kept: a later event may come first.
   */
  end(t: number): Sample[] {
    const breakpoints: Breakpoint[] = []
    advancePieces(this.#state, t, breakpoints)
    const samples: Sample[] = []
    const last = this.#last
    const state = this.#passBreakpoints(breakpoints, t, samples)
    samples.push(this.#add(state, 'end', undefined))
    this.#last = last
    return samples
  }

  /**
   * Adds a sample at each breakpoint strictly between the state after the last event and t; returns
   * the state at t. Breakpoints at t itself belong to what happens at t.
   */
  #passBreakpoints(breakpoints: readonly Breakpoint[], t: number, samples: Sample[]): SimState {
    let state = this.#state
    const times = breakpoints.length > 1 ? ceilings(breakpoints).sort(byNumber) : ceilings(breakpoints)
    for (const bt of times) {
      if (bt <= state.t || bt >= t) continue
      state = advance(state, bt - state.t)
      samples.push(this.#add(state, 'breakpoint', undefined))
    }
    return t > state.t ? advance(state, t - state.t) : state
  }

  /** A sample after the events applied so far (`event`: the one it is just before or after). */
  #add(state: SimState, at: SampleAt, event: AttemptEvent | undefined): StreamSample {
    const applied = this.#applied
    const eventIndex = event === undefined ? -1 : at === 'after' ? applied - 1 : applied
    this.#last = new StreamSample(state, at, eventIndex, event, applied, this.#isolation, this.#last)
    return this.#last
  }
}

function ceilings(breakpoints: readonly Breakpoint[]): number[] {
  const times: number[] = []
  for (const b of breakpoints) times.push(Math.ceil(b.t))
  return times
}

function byNumber(a: number, b: number): number {
  return a - b
}

/** The exact state at time t (≥ base.t), from the last sample at or before it. */
export function sampleAt(base: Sample, t: number): Sample {
  if (base.t === t) return base
  const state = advance(base.state, Math.round(t) - base.t)
  return new StreamSample(state, 'end', -1, undefined, base.applied, base.isolation)
}

/** Drive output on and not stopping: the motor is being driven at its reference. */
export function isRunning(drive: DriveReading): boolean {
  return (
    drive.outputOn &&
    (drive.control === 'accelerating' || drive.control === 'atSpeed' || drive.control === 'decelerating')
  )
}

/** Events that mean hands on terminals: wiring, fitting a contact block, changing a fuse, the motor cable. */
export function isTerminalWork(event: AttemptEvent | undefined): boolean {
  return (
    event?.type === 'wire.added' ||
    event?.type === 'wire.removed' ||
    event?.type === 'device.contactFitted' ||
    event?.type === 'fuse.replaced' ||
    event?.type === 'motor.conductorLanded' ||
    event?.type === 'motor.cableReplaced'
  )
}

/** The sample just before a terminal work event: what the apprentice's hands met. */
export function isTerminalWorkMoment(sample: Sample): boolean {
  return sample.at === 'before' && isTerminalWork(sample.event)
}
