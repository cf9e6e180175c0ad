// Replaying an attempt's log: jump from event to event (closed form in between) and sample at any time.
import type { AttemptEvent } from './events'
import { readCircuit, readDrive } from './readings'
import type { SimulationSetup } from './setup'
import { advanceForSample, applyEventCollecting, createSimulation } from './simulation'
import type { BreakpointKind, Timeline, TimelineSample, TimelineSegment } from './types'

export function replay(setup: SimulationSetup, events: readonly AttemptEvent[]): Timeline {
  let state = createSimulation(setup)
  const segments: TimelineSegment[] = [{ from: 0, to: 0, cause: { kind: 'start' }, state }]
  const breakpoints: { t: number; what: BreakpointKind }[] = []
  for (let index = 0; index < events.length; index++) {
    const event = events[index]
    state = applyEventCollecting(state, event, breakpoints)
    segments[segments.length - 1].to = event.t
    segments.push({ from: event.t, to: event.t, cause: { kind: 'event', index, type: event.type }, state })
  }
  return { segments, breakpoints, end: state.t, eventCount: events.length }
}

/** Index of the last segment starting at or before t (the state after every event up to t). */
function segmentAt(timeline: Timeline, t: number): number {
  let lo = 0
  let hi = timeline.segments.length - 1
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1
    if (timeline.segments[mid].from <= t) lo = mid
    else hi = mid - 1
  }
  return lo
}

/** The drive and circuit at any time t (ms, ≥ 0; past the end the last state runs on). */
export function sampleTimeline(timeline: Timeline, t: number): TimelineSample {
  const at = Math.max(0, t)
  const segment = segmentAt(timeline, at)
  const state = advanceForSample(timeline.segments[segment].state, at)
  return { ...readDrive(state), circuit: readCircuit(state), segment }
}
