// What the panel and the grader read from a state: the control circuit and the drive.
import { busVoltsAt, SAFE_BUS_VOLTS } from './bus'
import { circuitConfig, pointsOf } from './circuit/config'
import { solveCircuit, solveMeter } from './circuit/controlCircuit'
import { inputRegion } from './circuit/inputThresholds'
import { inputFunctions } from './functions'
import { speedAt } from './motion'
import { shaftRpm, synchronousRpm } from './motor'
import { alarmsFor, faultNotice } from './notices'
import {
  DIGITAL_INPUT_NUMBERS,
  digitalInputPoint,
  isDrivePowerPoint,
  isProverPoint,
  PROVER_VOLTS,
  type PointId,
} from './points'
import { activeReference, isOutputOn } from './settle'
import type { CircuitReading, DriveReading, MeterReading, SimState } from './types'

function round(value: number, digits = 9): number {
  // Readings are rounded so that they serialise the same way everywhere (and -0 reads as 0).
  const factor = 10 ** digits
  const r = Math.round(value * factor) / factor
  return r === 0 ? 0 : r
}

interface PowerPotential {
  /** AC phasor, RMS volts (relative to PE). */
  re: number
  im: number
  dc: number
}

/** Power-terminal potentials relative to PE (line-to-earth = line/√3; bus split ±½ around earth, from memory). */
function powerPotential(point: PointId, state: SimState, busVolts: number): PowerPotential {
  const phase = state.power.on ? state.lineVolts / Math.sqrt(3) : 0
  const angle = (k: number) => (-2 * Math.PI * k) / 3
  switch (point) {
    case 'drive.l1':
      return { re: phase, im: 0, dc: 0 }
    case 'drive.l2':
      return { re: phase * Math.cos(angle(1)), im: phase * Math.sin(angle(1)), dc: 0 }
    case 'drive.l3':
      return { re: phase * Math.cos(angle(2)), im: phase * Math.sin(angle(2)), dc: 0 }
    case 'drive.dcp':
      return { re: 0, im: 0, dc: busVolts / 2 }
    case 'drive.dcn':
      return { re: 0, im: 0, dc: -busVolts / 2 }
    default:
      return { re: 0, im: 0, dc: 0 }
  }
}

function isLineTerminal(point: PointId): boolean {
  return point === 'drive.l1' || point === 'drive.l2' || point === 'drive.l3'
}

function meterReading(state: SimState): MeterReading {
  const { red, black } = state.meter
  if (red === null || black === null) return { red, black, volts: null, mode: 'DC', floating: false }
  if (isProverPoint(red) || isProverPoint(black)) {
    // The proving unit is a source of its own: it reads only between its two terminals.
    if (isProverPoint(red) && isProverPoint(black)) {
      const volts = red === black ? 0 : red === 'prover.pos' ? PROVER_VOLTS : -PROVER_VOLTS
      return { red, black, volts, mode: 'DC', floating: false }
    }
    return { red, black, volts: 0, mode: 'DC', floating: true }
  }
  const redPower = isDrivePowerPoint(red)
  const blackPower = isDrivePowerPoint(black)
  if (redPower && blackPower) {
    const bus = busVoltsAt(state.bus, state.t, state.lineVolts)
    const a = powerPotential(red, state, bus)
    const b = powerPotential(black, state, bus)
    // An auto-ranging meter: AC when a line terminal is probed, DC otherwise.
    if (isLineTerminal(red) || isLineTerminal(black)) {
      return {
        red,
        black,
        volts: round(Math.hypot(a.re - b.re, a.im - b.im), 6),
        mode: 'AC',
        floating: false,
      }
    }
    return { red, black, volts: round(a.dc - b.dc, 6), mode: 'DC', floating: false }
  }
  if (redPower || blackPower) {
    // The control circuit is isolated from the power circuit: nothing to close the meter's loop.
    return {
      red,
      black,
      volts: 0,
      mode: isLineTerminal(red) || isLineTerminal(black) ? 'AC' : 'DC',
      floating: true,
    }
  }
  const { index } = pointsOf(state)
  const config = circuitConfig(state, state.bus.controlOn, state.circuit.relayClosed)
  const result = solveMeter(config, index.get(red)!, index.get(black)!)
  return { red, black, volts: round(result.volts, 6), mode: 'DC', floating: result.floating }
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
    meter: meterReading(state),
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
    outputOn: isOutputOn(value.control),
    direction: context.direction,
    referenceHz: round(reference.hz),
    targetHz: round(Math.abs(target)),
    outputHz: round(Math.abs(hz)),
    speedRpm: round(rpm),
    synchronousRpm: round(synchronousRpm(Math.abs(hz), poles)),
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
