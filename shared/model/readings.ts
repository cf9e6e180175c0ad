// What the panel and the grader read from a state: the control circuit and the drive.
import { busVoltsAt, SAFE_BUS_VOLTS } from './bus'
import { circuitConfig, pointsOf } from './circuit/config'
import { solveCircuit } from './circuit/controlCircuit'
import { inputRegion } from './circuit/inputThresholds'
import { inputFunctions } from './functions'
import { readMeter } from './meter'
import { speedAt } from './motion'
import { shaftRpm, synchronousRpm } from './motor'
import { phaseOrderReversed } from './motorCable'
import { alarmsFor, faultNotice } from './notices'
import { outputFigures } from './output'
import { DIGITAL_INPUT_NUMBERS, digitalInputPoint, type PointId } from './points'
import { activeReference, isOutputOn } from './settle'
import type { CircuitReading, DriveReading, SimState } from './types'

function round(value: number, digits = 9): number {
  // Readings are rounded so that they serialise the same way everywhere (and -0 reads as 0).
  const factor = 10 ** digits
  const r = Math.round(value * factor) / factor
  return r === 0 ? 0 : r
}

export function readCircuit(state: SimState): CircuitReading {
  const { points, index } = pointsOf(state)
  const config = circuitConfig(state, state.bus.controlOn, state.circuit.relayClosed)
  const solution = solveCircuit(config)
  const volts = (point: PointId) => solution.netVolts[solution.netOfPoint[index.get(point)!]]
  const nodes: Record<PointId, number> = {}
  for (const point of points) nodes[point] = round(volts(point))
  const functions = inputFunctions(state.settings.active)
  return {
    supplyOn: solution.supplyOn,
    supplyVolts: round(volts('drive.p24') - volts('drive.0v')),
    supplyMilliamps: round(solution.supplyAmps * 1000),
    supplyOverloaded: solution.supplyOverloaded,
    referenceVolts: round(solution.referenceOn ? volts('drive.p10') - volts('drive.0v') : 0),
    referenceOverloaded: solution.referenceOverloaded,
    analogVolts: round(state.circuit.analogVolts),
    relayClosed: state.circuit.relayClosed,
    nodes,
    inputs: DIGITAL_INPUT_NUMBERS.map((n, i) => ({
      input: n,
      point: digitalInputPoint(n),
      function: functions[i],
      volts: round(solution.inputs[i].volts),
      milliamps: round(solution.inputs[i].milliamps),
      region: inputRegion(solution.inputs[i].volts, solution.inputs[i].milliamps),
      on: state.inputs[i],
    })),
    meter: readMeter(state),
  }
}

/**
 * True when readDrive(a) and readDrive(b) are equal: every part of the state that readDrive reads is the
 * same object or value in both (states share the parts an event leaves alone, so identity is enough).
 * Lets a reader of a replay share one reading between two states of one moment, such as the states
 * before and after a meter probe moves. Keep in step with readDrive and activeReference.
 */
export function sameDriveReading(a: SimState, b: SimState): boolean {
  return (
    a === b ||
    (a.t === b.t &&
      a.settings.active === b.settings.active &&
      a.drive === b.drive &&
      a.power === b.power &&
      a.bus === b.bus &&
      a.speed === b.speed &&
      a.reference === b.reference &&
      a.inputs === b.inputs &&
      a.circuit === b.circuit &&
      a.machine === b.machine &&
      a.motor === b.motor &&
      a.lineVolts === b.lineVolts &&
      (a.messages === b.messages || (a.messages.length === 0 && b.messages.length === 0)))
  )
}

// A reading shares arrays with its state and with other readings (messages and alarms always did), so
// that a long replay read moment by moment makes no copies: readings are read-only, like the state.
const NO_FAULTS: DriveReading['faults'] = []
const NO_ALARMS: DriveReading['alarms'] = []

export function readDrive(state: SimState): DriveReading {
  const a = state.settings.active
  const value = state.drive.value
  const context = state.drive.context
  const busVolts = busVoltsAt(state.bus, state.t, state.lineVolts)
  const hz = speedAt(state.speed, state.t, state.machine.coastSeconds * 1000)
  const reference = activeReference(state, state.reference, state.t)
  const target = state.speed.targetHz + state.speed.targetSlope * (state.t - state.speed.since)
  const poles = a['motor.poles']
  const rpm = shaftRpm(hz, poles, a['motor.ratedFrequency'], a['motor.ratedSpeed'])
  const outputOn = isOutputOn(value.control)
  const output = outputFigures(hz, outputOn, a, state.lineVolts, state.motor.nameplate, state.machine)
  return {
    t: state.t,
    power: value.power,
    lineOn: state.power.on,
    locked: state.power.locked,
    busVolts: round(busVolts, 6),
    busHazard: busVolts > SAFE_BUS_VOLTS,
    displayOn: state.bus.controlOn,
    control: value.control,
    controlSource: a['control.source'],
    outputOn,
    direction: context.direction,
    referenceHz: round(reference.hz),
    targetHz: round(Math.abs(target)),
    outputHz: round(Math.abs(hz)),
    speedRpm: round(rpm),
    synchronousRpm: round(synchronousRpm(Math.abs(hz), poles)),
    outputVolts: round(output.volts, 6),
    outputAmps: round(output.amps, 6),
    torquePercent: round(output.torquePercent, 6),
    motorRpm: round(phaseOrderReversed(state.motor) ? -rpm : rpm),
    alarms: state.bus.controlOn ? alarmsFor(a, state.circuit.referenceOverloaded) : NO_ALARMS,
    faults: context.faults.length === 0 ? NO_FAULTS : context.faults.map(faultNotice),
    tripped: value.fault === 'tripped',
    restartInterlock:
      context.interlock &&
      context.signals.run &&
      a['control.source'] === 'terminals' &&
      value.control === 'stopped',
    relayClosed: state.circuit.relayClosed,
    inputs: state.inputs,
    messages: state.messages,
  }
}
