// Advancing time in closed form: jump to the next breakpoint (end of a piece), settle, repeat.
import { controlThresholdVolts, nextBusBreakpoint, nominalBusVolts } from './bus'
import { copyState } from './copyState'
import { sendDrive } from './driveTransitions'
import { ModelInputError } from './errors'
import { nextReferenceLimit, nextSpeedBreakpoint } from './motion'
import { settle } from './settle'
import type { BreakpointKind, SimState } from './types'

export type Breakpoint = { t: number; what: BreakpointKind }
export type BreakpointSink = Breakpoint[] | undefined

function nextBreakpoint(state: SimState): Breakpoint | null {
  let best: Breakpoint | null = nextBusBreakpoint(state.bus, state.lineVolts)
  const speed = nextSpeedBreakpoint(state.speed, state.machine.coastSeconds * 1000)
  if (speed && (!best || speed.t < best.t)) best = speed
  const a = state.settings.active
  const limit = nextReferenceLimit(state.reference, a['speed.min'], a['speed.max'])
  if (limit !== null && (!best || limit < best.t)) best = { t: limit, what: 'referenceLimit' }
  return best
}

function atBreakpoint(state: SimState, bp: Breakpoint): SimState {
  const before = state.drive.value
  const threshold = controlThresholdVolts(state.lineVolts)
  let next = state
  if (bp.what === 'controlOn') {
    next = copyState(state)
    next.bus = { mode: 'charging', since: bp.t, volts: threshold, controlOn: true }
  } else if (bp.what === 'busCharged') {
    next = copyState(state)
    next.bus = { mode: 'steady', since: bp.t, volts: nominalBusVolts(state.lineVolts), controlOn: true }
    next.drive = sendDrive(state.drive, { type: 'BUS_CHARGED' })
  } else if (bp.what === 'controlOff') {
    next = copyState(state)
    next.bus = { mode: 'decayIdle', since: bp.t, volts: threshold, controlOn: false }
    next.drive = sendDrive(state.drive, { type: 'CONTROL_OFF' })
  }
  return settle(next, bp.t, before, next !== state)
}

const MAX_BREAKPOINTS_PER_STEP = 100_000

/**
 * Processes every breakpoint up to `target` (ms) and reports them to `sink`. The result's `t` is not
 * moved to `target` (the caller sets it): the pieces already describe every moment up to the next breakpoint.
 */
export function advancePieces(state: SimState, target: number, sink: BreakpointSink): SimState {
  let current = state
  for (let n = 0; n < MAX_BREAKPOINTS_PER_STEP; n++) {
    const bp = nextBreakpoint(current)
    if (!bp || bp.t > target) return current
    current = atBreakpoint(current, bp)
    sink?.push(bp)
  }
  throw new Error('The model did not settle (too many breakpoints in one step).')
}

export function advanceTo(state: SimState, target: number, sink: BreakpointSink): SimState {
  const current = advancePieces(state, target, sink)
  if (target === current.t) return current
  const moved = copyState(current)
  moved.t = target
  return moved
}

export function advance(state: SimState, dtMs: number): SimState {
  if (!Number.isInteger(dtMs) || dtMs < 0) {
    throw new ModelInputError(`Time steps are whole milliseconds, zero or more (got ${dtMs}).`)
  }
  return advanceTo(state, state.t + dtMs, undefined)
}

/** For sampling a replay at any time (fractional allowed): not part of the event path. */
export function advanceForSample(state: SimState, t: number): SimState {
  return t <= state.t ? state : advanceTo(state, t, undefined)
}
