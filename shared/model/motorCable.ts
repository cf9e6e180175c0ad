// The motor cable: which drive output each motor terminal gets, phase loss and phase order.
import { MOTOR_TERMINALS, OUTPUT_PHASES, type MotorTerminal, type OutputPhase } from './points'
import type { MotorCable } from './setup'
import type { MotorState } from './types'

export const STRAIGHT_CABLE: MotorCable = { u: 'u1', v: 'v1', w: 'w1' }

/** The drive output that reaches a motor terminal through an intact conductor, if one does. */
export function conductorOn(motor: MotorState, terminal: MotorTerminal): OutputPhase | null {
  for (const phase of OUTPUT_PHASES) {
    if (motor.cable[phase] === terminal && !motor.openConductors.includes(phase)) return phase
  }
  return null
}

/** A motor phase gets no current: a conductor is broken or not landed (so a terminal is left empty). */
export function phaseOpen(motor: MotorState): boolean {
  if (motor.openConductors.length > 0) return true
  return motor.cable.u === null || motor.cable.v === null || motor.cable.w === null
}

/**
 * The motor turns the other way: the conductors reach U1, V1, W1 in the opposite phase order (an odd
 * permutation, such as one swapped pair). Meaningful only when no phase is open.
 */
export function phaseOrderReversed(motor: MotorState): boolean {
  // Read on every drive reading: no allocation. Count the inversions of the permutation (u, v, w).
  const u = MOTOR_TERMINALS.indexOf(motor.cable.u as MotorTerminal)
  const v = MOTOR_TERMINALS.indexOf(motor.cable.v as MotorTerminal)
  const w = MOTOR_TERMINALS.indexOf(motor.cable.w as MotorTerminal)
  return (+(u > v) + +(u > w) + +(v > w)) % 2 === 1
}
