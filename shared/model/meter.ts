// The bench multimeter: what it shows on each selector position, from the model's circuits.
//
// Behaviour modelled (a handheld true-RMS multimeter):
// - V DC shows the average of the voltage: an integrating converter averages over whole mains cycles, so
//   V DC across an AC source reads about 0 V (common practice; integrating ADCs reject the mains frequency
//   that way, from memory).
// - V AC shows the true RMS of the AC part only: the input is AC-coupled, a series capacitor blocking DC
//   (Keysight blog "Digital multimeter AC measurement considerations", 2018: AC and DC coupling), so
//   V AC across a DC source reads about 0 V. On the drive's output it shows the fundamental, as a meter
//   with a low-pass filter would (an unfiltered meter reads a PWM waveform higher, from memory).
// - Resistance and continuity drive a small test current from the meter itself and need the circuit
//   de-energised; with a voltage across the probes the meter shows a voltage-present warning instead.
// - Probes on circuits that share no conductor (the control circuit, the power circuit, the proving unit)
//   read 0 V and over-range: nothing closes the meter's loop.
import { busVoltsAt, SAFE_BUS_VOLTS } from './bus'
import { circuitConfig, pointsOf } from './circuit/config'
import { solveMeter } from './circuit/controlCircuit'
import { controlResistance, networkResistance } from './circuit/resistance'
import type { MeterMode } from './meterModes'
import { conductorOn } from './motorCable'
import { windingOhms } from './nameplate'
import { speedAt } from './motion'
import { vPerHzVolts } from './output'
import {
  isDrivePowerPoint,
  isMotorPoint,
  isProverPoint,
  MOTOR_TERMINALS,
  OUTPUT_PHASES,
  PROVER_AC_VOLTS,
  PROVER_VOLTS,
  type MotorTerminal,
  type OutputPhase,
  type PointId,
} from './points'
import { isOutputOn } from './settle'
import type { MeterReading, SimState } from './types'

/**
 * Resistance range top: above it the meter shows over-range (ours; handheld meters' top ranges are
 * commonly 40–60 MΩ, from memory).
 */
export const RESISTANCE_RANGE_OHMS = 40e6
/** Continuity works on a low range: above it the window shows over-range (ours). */
export const CONTINUITY_RANGE_OHMS = 1000
/**
 * The continuity tone sounds below this resistance (common practice: meters beep somewhere below
 * 10–50 Ω, from memory; ours is 30 Ω). A closed contact or a motor winding beeps; an input does not.
 */
export const CONTINUITY_TONE_OHMS = 30
/**
 * On resistance or continuity, a voltage across the probes at least this large makes the meter show a
 * voltage-present warning instead of a resistance (our figure).
 */
export const VOLTAGE_PRESENT_VOLTS = 2
/** Resistance of one motor-cable conductor (ours: tens of metres of a few mm²). */
export const CABLE_CONDUCTOR_OHMS = 0.1

/** Which circuit a point belongs to: circuits with no conductor in common read nothing between them. */
type Domain = 'control' | 'power' | 'prover'

function domainOf(point: PointId): Domain {
  if (isProverPoint(point)) return 'prover'
  if (isDrivePowerPoint(point) || isMotorPoint(point)) return 'power'
  return 'control'
}

/** A point's potential: an AC phasor (RMS volts) and a DC part, against the domain's reference. */
interface Potential {
  re: number
  im: number
  dc: number
}
const ZERO: Potential = { re: 0, im: 0, dc: 0 }

function phasor(rms: number, degrees: number): Potential {
  const a = (degrees * Math.PI) / 180
  return { re: rms * Math.cos(a), im: rms * Math.sin(a), dc: 0 }
}

function outputPotential(state: SimState, phase: OutputPhase): Potential {
  if (!isOutputOn(state.drive.value.control)) return ZERO
  const hz = speedAt(state.speed, state.t, state.machine.coastSeconds * 1000)
  const phaseVolts = vPerHzVolts(hz, state.settings.active, state.lineVolts) / Math.sqrt(3)
  // Forward: U, V, W at 0°, −120°, −240°; reverse swaps V and W.
  const step = state.drive.context.direction === 'reverse' ? 120 : -120
  return phasor(phaseVolts, step * OUTPUT_PHASES.indexOf(phase))
}

/** Power-circuit potentials against PE (line to earth = line ÷ √3; the bus split ±½ around earth, from memory). */
function powerPotential(state: SimState, point: PointId): Potential {
  const phase = state.power.on ? state.lineVolts / Math.sqrt(3) : 0
  switch (point) {
    case 'drive.l1':
      return phasor(phase, 0)
    case 'drive.l2':
      return phasor(phase, -120)
    case 'drive.l3':
      return phasor(phase, -240)
    case 'drive.dcp':
    case 'drive.dcn': {
      const half = busVoltsAt(state.bus, state.t, state.lineVolts) / 2
      return { re: 0, im: 0, dc: point === 'drive.dcp' ? half : -half }
    }
    case 'drive.u':
    case 'drive.v':
    case 'drive.w':
      return outputPotential(state, point.slice(6) as OutputPhase)
    case 'motor.u1':
    case 'motor.v1':
    case 'motor.w1': {
      const phase = conductorOn(state.motor, point.slice(6) as MotorTerminal)
      return phase ? outputPotential(state, phase) : ZERO
    }
    default:
      return ZERO
  }
}

function proverPotential(point: PointId): Potential {
  if (point === 'prover.pos') return { re: 0, im: 0, dc: PROVER_VOLTS }
  if (point === 'prover.ac') return phasor(PROVER_AC_VOLTS, 0)
  return ZERO
}

function round(value: number, digits = 6): number {
  const factor = 10 ** digits
  const r = Math.round(value * factor) / factor
  return r === 0 ? 0 : r
}

/** The voltage between two points: AC part (RMS magnitude) and DC part (red − black). */
export interface VoltageBetween {
  ac: number
  dc: number
  floating: boolean
}

export function voltageBetween(state: SimState, red: PointId, black: PointId): VoltageBetween {
  const domain = domainOf(red)
  if (domain !== domainOf(black)) return { ac: 0, dc: 0, floating: true }
  if (domain === 'control') {
    // The control circuit is DC: solved with the meter's 10 MΩ in the network.
    const { index } = pointsOf(state)
    const config = circuitConfig(state, state.bus.controlOn, state.circuit.relayClosed)
    const solved = solveMeter(config, index.get(red)!, index.get(black)!)
    return { ac: 0, dc: round(solved.volts), floating: solved.floating }
  }
  const potential = domain === 'power' ? (p: PointId) => powerPotential(state, p) : proverPotential
  const a = potential(red)
  const b = potential(black)
  return { ac: round(Math.hypot(a.re - b.re, a.im - b.im)), dc: round(a.dc - b.dc), floating: false }
}

/** Ohms between two points of the motor circuit: cable conductors and the windings, star or delta. */
function motorCircuitResistance(state: SimState, red: PointId, black: PointId): number | null {
  // Nodes: drive U, V, W (0–2), motor U1, V1, W1 (3–5), star point (6).
  const nodeOf = (point: PointId): number => {
    const phase = OUTPUT_PHASES.indexOf(point.slice(6) as OutputPhase)
    if (point.startsWith('drive.') && phase >= 0) return phase
    const terminal = MOTOR_TERMINALS.indexOf(point.slice(6) as MotorTerminal)
    return point.startsWith('motor.') && terminal >= 0 ? 3 + terminal : -1
  }
  const from = nodeOf(red)
  const to = nodeOf(black)
  if (from < 0 || to < 0) return null
  const resistors: { a: number; b: number; ohms: number }[] = []
  OUTPUT_PHASES.forEach((phase, i) => {
    const terminal = state.motor.cable[phase]
    if (terminal !== null && !state.motor.openConductors.includes(phase))
      resistors.push({ a: i, b: 3 + MOTOR_TERMINALS.indexOf(terminal), ohms: CABLE_CONDUCTOR_OHMS })
  })
  const lineToLine = windingOhms(state.motor.nameplate)
  for (let k = 0; k < 3; k++) {
    // Both connections read R_LL between any two terminals: star R_LL/2 per phase, delta 1.5·R_LL.
    if (state.motor.nameplate.connection === 'star') resistors.push({ a: 3 + k, b: 6, ohms: lineToLine / 2 })
    else resistors.push({ a: 3 + k, b: 3 + ((k + 1) % 3), ohms: 1.5 * lineToLine })
  }
  return networkResistance(7, resistors, from, to)
}

/** Ohms between two points with their circuit de-energised; null when nothing joins them (over-range). */
export function resistanceBetween(state: SimState, red: PointId, black: PointId): number | null {
  if (red === black) return 0
  const domain = domainOf(red)
  if (domain !== domainOf(black)) return null
  if (domain === 'power') return motorCircuitResistance(state, red, black)
  if (domain === 'prover') return null
  const { index } = pointsOf(state)
  const config = circuitConfig(state, state.bus.controlOn, state.circuit.relayClosed)
  return controlResistance(config, index.get(red)!, index.get(black)!)
}

/** The circuit a point is on is energised (whether or not a voltage shows between the probes). */
export function pointEnergised(state: SimState, point: PointId): boolean {
  switch (domainOf(point)) {
    case 'prover':
      return true
    case 'control':
      return state.bus.controlOn
    case 'power':
      return state.power.on || busVoltsAt(state.bus, state.t, state.lineVolts) > SAFE_BUS_VOLTS
  }
}

/**
 * The voltage range that shows what could be present between two points, so the range a dead test must
 * be made on: V AC where either point is on an AC circuit (the line, the drive's output, the motor
 * terminals, the proving unit's AC output), V DC otherwise (the DC bus, the control circuit).
 */
export function voltageRangeFor(red: PointId, black: PointId): 'acVolts' | 'dcVolts' {
  const ac = (p: PointId) =>
    p === 'drive.l1' ||
    p === 'drive.l2' ||
    p === 'drive.l3' ||
    p === 'drive.u' ||
    p === 'drive.v' ||
    p === 'drive.w' ||
    isMotorPoint(p) ||
    p === 'prover.ac'
  return ac(red) || ac(black) ? 'acVolts' : 'dcVolts'
}

const BLANK = (red: PointId | null, black: PointId | null, mode: MeterMode): MeterReading => ({
  red,
  black,
  mode,
  shows: 'blank',
  volts: null,
  ohms: null,
  tone: false,
  floating: false,
  liveResistanceTest: false,
})

export function readMeter(state: SimState): MeterReading {
  const { red, black, mode } = state.meter
  if (mode === 'off') return BLANK(red, black, mode)
  const placed = red !== null && black !== null
  if (mode === 'acVolts' || mode === 'dcVolts') {
    if (!placed) return { ...BLANK(red, black, mode), shows: 'volts' }
    const v = voltageBetween(state, red, black)
    return {
      ...BLANK(red, black, mode),
      shows: 'volts',
      volts: mode === 'acVolts' ? v.ac : v.dc,
      floating: v.floating,
    }
  }
  // Resistance and continuity.
  if (!placed) return { ...BLANK(red, black, mode), shows: 'overRange' }
  const v = voltageBetween(state, red, black)
  const present = Math.max(v.ac, Math.abs(v.dc)) >= VOLTAGE_PRESENT_VOLTS
  const live = present || pointEnergised(state, red) || pointEnergised(state, black)
  const base = { ...BLANK(red, black, mode), floating: v.floating, liveResistanceTest: live }
  if (present) return { ...base, shows: 'voltagePresent' }
  const ohms = resistanceBetween(state, red, black)
  const range = mode === 'continuity' ? CONTINUITY_RANGE_OHMS : RESISTANCE_RANGE_OHMS
  if (ohms === null || ohms > range) return { ...base, shows: 'overRange' }
  const shown = round(ohms, 4)
  return { ...base, shows: 'ohms', ohms: shown, tone: mode === 'continuity' && shown < CONTINUITY_TONE_OHMS }
}
