// Injected faults as the grader sees them: is one still there, and what would the bench read without it.
import { copyState } from './copyState'
import type { InjectedFault } from './setup'
import { settle } from './settle'
import type { SimState } from './types'

/** The injected fault is still in the circuit (not yet repaired). */
export function faultPresent(state: SimState, fault: InjectedFault): boolean {
  switch (fault.kind) {
    case 'brokenWire':
      return state.brokenWires.includes(fault.wireId) && state.wires.some((w) => w.id === fault.wireId)
    case 'blownFuse':
      return state.fuseBlown
    case 'motorConductorOpen':
      return state.motor.openConductors.includes(fault.conductor)
    default: {
      // Still there until a block of the labelled type is fitted (a wrong block fitted counts as present).
      const device = state.devices[fault.device]
      return device !== undefined && (device.fault !== 'none' || device.contact !== device.spec.contact)
    }
  }
}

/**
 * The same moment with one injected fault repaired and nothing else changed, settled: what a healthy
 * bench would read here. A measurement tells a fault apart when the meter shows something different on
 * this state than on the real one (readMeter on both).
 */
export function withFaultCleared(state: SimState, fault: InjectedFault): SimState {
  if (!faultPresent(state, fault)) return state
  const draft = copyState(state)
  switch (fault.kind) {
    case 'brokenWire':
      draft.brokenWires = state.brokenWires.filter((id) => id !== fault.wireId)
      break
    case 'blownFuse':
      draft.fuseBlown = false
      break
    case 'motorConductorOpen':
      draft.motor = {
        ...state.motor,
        openConductors: state.motor.openConductors.filter((c) => c !== fault.conductor),
      }
      break
    default: {
      const device = state.devices[fault.device]
      draft.devices = {
        ...state.devices,
        [fault.device]: { ...device, fault: 'none', contact: device.spec.contact ?? device.contact },
      }
    }
  }
  return settle(draft, state.t, state.drive.value, true)
}
