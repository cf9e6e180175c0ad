// Replays an attempt through the model and keeps the moments grading looks at: each event's time
// (just before and just after it applies) and the model's breakpoints in between (a ramp reaching
// its target, a trip, standstill …). Between two samples everything is closed form, so nothing is
// sampled per millisecond.
import {
  advance,
  readCircuit,
  readDrive,
  replay,
  type AttemptEvent,
  type CircuitReading,
  type DriveReading,
  type SimState,
  type SimulationSetup,
} from '../model'

export type SampleAt = 'start' | 'before' | 'after' | 'breakpoint' | 'end'

export interface Sample {
  t: number
  at: SampleAt
  /** Index of the event this sample belongs to ('before'/'after'); -1 otherwise. */
  eventIndex: number
  /** How many events the state has had applied (events[0 … applied − 1]). */
  applied: number
  state: SimState
  drive: DriveReading
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
}

function sampleOf(state: SimState, at: SampleAt, eventIndex: number, applied: number): Sample {
  return { t: state.t, at, eventIndex, applied, state, drive: readDrive(state) }
}

export function traceAttempt(
  setup: SimulationSetup,
  events: readonly AttemptEvent[],
  endAt?: number,
): AttemptTrace {
  const lastEventT = events.length > 0 ? events[events.length - 1].t : 0
  const end = Math.max(lastEventT, endAt ?? 0)
  // The model's own replay gives the state after each event and where its closed-form pieces end.
  const timeline = replay(setup, [...events])
  const breakpoints = timeline.breakpoints.map((b) => Math.ceil(b.t)).sort((a, b) => a - b)
  let next = 0
  const samples: Sample[] = []
  let state = timeline.segments[0].state
  samples.push(sampleOf(state, 'start', -1, 0))

  let applied = 0
  const advanceTo = (t: number) => {
    while (next < breakpoints.length && breakpoints[next] <= t) {
      const bt = breakpoints[next++]
      if (bt > state.t && bt < t) {
        state = advance(state, bt - state.t)
        samples.push(sampleOf(state, 'breakpoint', -1, applied))
      }
    }
    if (t > state.t) state = advance(state, t - state.t)
  }

  events.forEach((event, index) => {
    advanceTo(event.t)
    samples.push(sampleOf(state, 'before', index, index))
    state = timeline.segments[index + 1].state
    applied = index + 1
    samples.push(sampleOf(state, 'after', index, applied))
  })
  advanceTo(end)
  samples.push(sampleOf(state, 'end', -1, applied))

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
    // Last sample at or before t (binary search; samples are in time order).
    let lo = 0
    let hi = samples.length - 1
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1
      if (samples[mid].t <= t) lo = mid
      else hi = mid - 1
    }
    const base = samples[lo]
    if (base.t === t) return base
    return sampleOf(advance(base.state, Math.round(t) - base.t), 'end', -1, base.applied)
  }

  return { setup, events, samples, end, circuit, stateAt }
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
    event.type === 'fuse.replaced'
  )
}
