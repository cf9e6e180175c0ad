// Settling the model at one instant: circuit → inputs → drive machine → continuous pieces → machine,
// repeated until nothing changes. Works on a private shallow copy of the state (one per step).
import { circuitConfig, positionsKey, structureKey } from './circuit/config'
import { cachedDriveSummary, solveForDrive } from './circuit/controlCircuit'
import { nextInputState } from './circuit/inputThresholds'
import { copyState } from './copyState'
import { NO_SIGNALS, type DriveEvent } from './driveMachine'
import { sendDrive } from './driveTransitions'
import { driveSignals, functionLevels, sameSignals, signalsMatch } from './functions'
import {
  decelerationOf,
  isAtStandstill,
  planSpeedInto,
  referenceAt,
  speedAt,
  trendOf,
  type SpeedPlan,
} from './motion'
import { phaseOpen } from './motorCable'
import { alarmsFor } from './notices'
import type { SettingValues } from './settings'
import type { ControlState, DriveMachineValue, ReferencePiece, SimState, SpeedPiece } from './types'

const RUNNING: ReadonlySet<ControlState> = new Set(['accelerating', 'atSpeed', 'decelerating'])
/** Output stage on: running, or ramping down to a controlled stop. */
const OUTPUT_ON: ReadonlySet<ControlState> = new Set([
  'accelerating',
  'atSpeed',
  'decelerating',
  'rampStopping',
])

export function isRunning(control: ControlState): boolean {
  return RUNNING.has(control)
}
export function isOutputOn(control: ControlState): boolean {
  return OUTPUT_ON.has(control)
}

function relayCondition(value: DriveMachineValue, fn: SettingValues['relay.function']): boolean {
  switch (fn) {
    case 'running':
      return isOutputOn(value.control)
    case 'ready':
      return value.power === 'ready' && value.fault === 'clear'
    case 'fault':
      return value.fault === 'tripped'
    case 'atSpeed':
      return value.control === 'atSpeed'
  }
}

interface CircuitSources {
  wires: SimState['wires']
  brokenWires: SimState['brokenWires']
  devices: SimState['devices']
  settings: SettingValues
  fuseBlown: boolean
  controlOn: boolean
  relay: boolean
}
/** What each circuit summary was computed from, to skip rebuilding an unchanged configuration. */
const sourcesOf = new WeakMap<SimState['circuit'], CircuitSources>()

/**
 * Re-solves the control network if its configuration changed; updates inputs (with hysteresis). An input
 * that stopped responding reads OFF whatever its terminal sees (the terminal's voltage is unchanged).
 */
function refreshCircuit(draft: SimState): void {
  solveCircuit(draft)
  if (draft.deadInputs) silenceDeadInputs(draft, draft.deadInputs)
}

function silenceDeadInputs(draft: SimState, dead: readonly number[]): void {
  if (!dead.some((n) => draft.inputs[n - 1])) return
  const inputs = [...draft.inputs]
  for (const n of dead) inputs[n - 1] = false
  draft.inputs = inputs
}

function solveCircuit(draft: SimState): void {
  const controlOn = draft.bus.controlOn
  const relay = controlOn && relayCondition(draft.drive.value, draft.settings.active['relay.function'])
  const last = sourcesOf.get(draft.circuit)
  if (
    last !== undefined &&
    last.wires === draft.wires &&
    last.brokenWires === draft.brokenWires &&
    last.devices === draft.devices &&
    last.settings === draft.settings.active &&
    last.fuseBlown === draft.fuseBlown &&
    last.controlOn === controlOn &&
    last.relay === relay
  ) {
    return
  }
  const positions = positionsKey(draft)
  const summary =
    cachedDriveSummary(structureKey(draft, controlOn, relay), positions) ??
    solveForDrive(circuitConfig(draft, controlOn, relay), positions, relay)
  // One record per summary, overwritten in place (no allocation per refresh).
  let sources = sourcesOf.get(summary.circuit)
  if (sources === undefined) {
    sources = { wires: draft.wires, brokenWires: draft.brokenWires, devices: draft.devices } as CircuitSources
    sourcesOf.set(summary.circuit, sources)
  }
  sources.wires = draft.wires
  sources.brokenWires = draft.brokenWires
  sources.devices = draft.devices
  sources.settings = draft.settings.active
  sources.fuseBlown = draft.fuseBlown
  sources.controlOn = controlOn
  sources.relay = relay
  if (summary.circuit === draft.circuit) return
  let inputs = draft.inputs
  for (let i = 0; i < summary.regions.length; i++) {
    const on = nextInputState(draft.inputs[i], summary.regions[i])
    if (on !== inputs[i]) {
      if (inputs === draft.inputs) inputs = [...draft.inputs]
      inputs[i] = on
    }
  }
  draft.inputs = inputs
  draft.circuit = summary.circuit
}

type Levels = ReturnType<typeof functionLevels>

function trackRaiseLowerOrder(draft: SimState, levels: Levels): void {
  const raise = draft.bus.controlOn && levels.raise
  const lower = draft.bus.controlOn && levels.lower
  let first = draft.raiseLowerFirst
  if (raise && !lower) first = 'raise'
  else if (lower && !raise) first = 'lower'
  else if (!raise && !lower) first = null
  if (first !== draft.raiseLowerFirst) draft.raiseLowerFirst = first
}

/** +1 raise, −1 lower, 0 neither (or both held with "hold"). */
function raiseLowerDirection(state: SimState, levels: Levels): number {
  if (!state.bus.controlOn) return 0
  if (levels.raise && levels.lower) {
    if (state.settings.active['raiseLower.bothHeld'] === 'hold') return 0
    return state.raiseLowerFirst === 'raise' ? 1 : state.raiseLowerFirst === 'lower' ? -1 : 0
  }
  return levels.raise ? 1 : levels.lower ? -1 : 0
}

export interface ActiveReference {
  source: 'keypad' | 'analog' | 'raiseLower' | 'preset'
  hz: number
  /** Hz per ms (raise/lower only). */
  slope: number
}

/** Where the reference comes from now, from the command source and the remote source. */
function referenceSource(state: SimState, levels: Levels): ActiveReference['source'] {
  const a = state.settings.active
  if (a['control.source'] === 'keypad') return 'keypad'
  if (state.bus.controlOn && levels.preset) return 'preset'
  return a['reference.remoteSource']
}

function referenceHz(state: SimState, source: ActiveReference['source'], emop: ReferencePiece, t: number) {
  const a = state.settings.active
  switch (source) {
    case 'keypad':
      return a['reference.keypadSetpoint']
    case 'preset':
      return a['preset.speed1']
    case 'analog': {
      // 0–10 V scaled between minimum and maximum speed.
      const fraction = Math.min(1, Math.max(0, state.circuit.analogVolts / 10))
      return a['speed.min'] + (a['speed.max'] - a['speed.min']) * fraction
    }
    case 'raiseLower':
      return referenceAt(emop, t)
  }
}

/** The reference the drive follows now, from the command source and the remote source. */
export function activeReference(
  state: SimState,
  emop: ReferencePiece,
  t: number,
  levels: Levels = functionLevels(state.settings.active, state.inputs),
): ActiveReference {
  const source = referenceSource(state, levels)
  return { source, hz: referenceHz(state, source, emop, t), slope: source === 'raiseLower' ? emop.slope : 0 }
}

function clamp(value: number, min: number, max: number): number {
  return Math.min(max, Math.max(min, value))
}

/** Clamps, and treats a value within rounding of a limit as on it (a limit breakpoint lands there). */
function snapToLimits(value: number, min: number, max: number): number {
  const tolerance = 1e-9 * Math.max(1, max)
  if (value <= min + tolerance) return min
  if (value >= max - tolerance) return max
  return value
}

export function rampRates(settings: SettingValues) {
  return {
    accel: settings['speed.max'] / (settings['ramp.accelSeconds'] * 1000),
    decel: settings['speed.max'] / (settings['ramp.decelSeconds'] * 1000),
  }
}

/** Re-anchors the reference and speed pieces at `now` for the drive's current state. */
function replan(draft: SimState, now: number, levels: Levels): void {
  const a = draft.settings.active
  const min = a['speed.min']
  const max = a['speed.max']
  const control = draft.drive.value.control
  const running = isRunning(control)
  const emopHz = snapToLimits(referenceAt(draft.reference, now), min, max)
  let emopSlope = 0
  const raiseLowerActs =
    running && a['control.source'] === 'terminals' && a['reference.remoteSource'] === 'raiseLower'
  if (raiseLowerActs && !levels.preset) {
    const direction = raiseLowerDirection(draft, levels)
    if ((direction > 0 && emopHz < max) || (direction < 0 && emopHz > min)) {
      emopSlope = (direction * a['raiseLower.rate']) / 1000
    }
  }
  const old = draft.reference
  // Keep an unchanged piece as it is (fewer objects, and the same breakpoints as before).
  const reference: ReferencePiece =
    old.slope === emopSlope &&
    (emopSlope !== 0 || old.hz === emopHz) &&
    emopHz === snapToLimits(emopHz, min, max) &&
    Math.abs(referenceAt(old, now) - emopHz) <= 1e-12 * Math.max(1, max)
      ? old
      : { since: now, hz: emopHz, slope: emopSlope }
  const source = referenceSource(draft, levels)
  const sign = draft.drive.context.direction === 'reverse' ? -1 : 1
  const targetHz = running ? sign * clamp(referenceHz(draft, source, reference, now), min, max) : 0
  const targetSlope = running ? sign * (source === 'raiseLower' ? reference.slope : 0) : 0
  const plan: SpeedPlan = control === 'stopped' ? 'stopped' : control === 'coasting' ? 'coasting' : 'toTarget'
  const hzNow = speedAt(draft.speed, now, draft.machine.coastSeconds * 1000)
  draft.reference = reference
  const accel = a['speed.max'] / (a['ramp.accelSeconds'] * 1000)
  const decel = a['speed.max'] / (a['ramp.decelSeconds'] * 1000)
  const speed = planSpeedInto(SCRATCH_PIECE, hzNow, now, plan, targetHz, targetSlope, accel, decel)
  if (!samePiece(draft.speed, speed, now)) {
    draft.speed = {
      mode: speed.mode,
      since: speed.since,
      hz: speed.hz,
      slope: speed.slope,
      targetHz: speed.targetHz,
      targetSlope: speed.targetSlope,
    }
  }
}

/** Where replan plans the next piece; copied into the state only when it differs from the current one. */
const SCRATCH_PIECE: SpeedPiece = { mode: 'still', since: 0, hz: 0, slope: 0, targetHz: 0, targetSlope: 0 }

/** The new piece describes the same future as the old one. */
function samePiece(old: SimState['speed'], next: SimState['speed'], now: number): boolean {
  if (old.mode !== next.mode || old.slope !== next.slope || old.targetSlope !== next.targetSlope) return false
  // A new piece starting at zero speed has no zero crossing ahead, unlike the old one that reached it.
  if (Math.sign(old.hz) !== Math.sign(next.hz)) return false
  const oldTarget = old.targetHz + old.targetSlope * (now - old.since)
  if (Math.abs(oldTarget - next.targetHz) > 1e-12) return false
  if (old.mode === 'still') return true
  if (old.mode === 'coast') return old === next || (old.since === next.since && old.hz === next.hz)
  return Math.abs(old.hz + old.slope * (now - old.since) - next.hz) <= 1e-12
}

/** Raise/lower memory: back to minimum at a stop or at power loss when the settings say so. */
function applyMemories(before: DriveMachineValue, draft: SimState, now: number): void {
  const after = draft.drive.value
  if (after === before) return
  const a = draft.settings.active
  const stopped =
    isRunning(before.control) && !isRunning(after.control) && a['raiseLower.memoryAtStop'] === 'reset'
  const powerLost =
    before.power !== 'off' && after.power === 'off' && a['raiseLower.memoryAtPowerLoss'] === 'reset'
  if (stopped || powerLost) draft.reference = { since: now, hz: a['speed.min'], slope: 0 }
}

/** The event that tells the machine what the continuous part is doing, if it does not know yet. */
function machineFollowsMotion(state: SimState): DriveEvent | null {
  const control = state.drive.value.control
  const speed = state.speed
  // The output stage on with a motor phase open: the drive sees no current in it and trips at once.
  if (isOutputOn(control) && state.drive.value.fault === 'clear' && phaseOpen(state.motor))
    return { type: 'PHASE_LOSS' }
  if (isRunning(control)) {
    const trend = trendOf(speed)
    const wanted = trend === 'up' ? 'accelerating' : trend === 'down' ? 'decelerating' : 'atSpeed'
    if (wanted !== control) return { type: 'TREND', trend }
  }
  if (isOutputOn(control) && state.drive.value.fault === 'clear' && state.machine.minDecelSeconds > 0) {
    const tolerated = state.settings.active['speed.max'] / (state.machine.minDecelSeconds * 1000)
    if (decelerationOf(speed) > tolerated * (1 + 1e-9)) return { type: 'OVERVOLTAGE' }
  }
  if (control === 'rampStopping' && speed.mode === 'still') return { type: 'STANDSTILL' }
  if (control === 'coasting' && (speed.mode === 'still' || isAtStandstill(speed.hz)))
    return { type: 'STANDSTILL' }
  return null
}

/** Sends an event to the drive; true when its state changed. */
function send(draft: SimState, event: DriveEvent, now: number): boolean {
  const before = draft.drive.value
  const next = sendDrive(draft.drive, event)
  if (next === draft.drive) return false
  draft.drive = next
  applyMemories(before, draft, now)
  return true
}

/**
 * Settles a state at `now` (ms, fractional at breakpoints). `before` is the drive state before the
 * step began (for the raise/lower memories). `owned`: the caller made `input` in this step and
 * nobody else holds it, so it may be completed in place; otherwise a copy is returned.
 */
export function settle(
  input: SimState,
  now: number,
  before: DriveMachineValue = input.drive.value,
  owned = false,
): SimState {
  const draft: SimState = owned ? input : copyState(input)
  applyMemories(before, draft, now)
  for (let round = 0; round < 32; round++) {
    // A round that leaves the drive as it was (sendDrive keeps the object when nothing changes) is the
    // fixed point: the circuit is refreshed first and everything after it in the round already used it;
    // another round would find the same relay state, inputs and signals, and replan the same pieces.
    let driveChanged = false
    refreshCircuit(draft)
    const a = draft.settings.active
    const levels = functionLevels(a, draft.inputs)
    trackRaiseLowerOrder(draft, levels)
    const seen = draft.drive.context.signals
    if (draft.bus.controlOn ? !signalsMatch(a, levels, seen) : !sameSignals(NO_SIGNALS, seen)) {
      const signals = draft.bus.controlOn ? driveSignals(a, levels, true) : NO_SIGNALS
      driveChanged = send(draft, { type: 'SIGNALS', signals }, now) || driveChanged
    }
    if (draft.bus.controlOn && draft.circuit.supplyOverloaded !== draft.drive.context.causes.supplyOverload) {
      driveChanged =
        send(draft, { type: 'SUPPLY', overloaded: draft.circuit.supplyOverloaded }, now) || driveChanged
    }
    const alarmsPresent = alarmsFor(a, draft.circuit.referenceOverloaded).length > 0
    if (alarmsPresent !== (draft.drive.value.alarm === 'present')) {
      driveChanged = send(draft, { type: 'ALARMS', present: alarmsPresent }, now) || driveChanged
    }
    replan(draft, now, levels)
    const follow = machineFollowsMotion(draft)
    if (follow) {
      driveChanged = send(draft, follow, now) || driveChanged
      replan(draft, now, levels)
    }
    if (!driveChanged) return draft
  }
  return draft
}
