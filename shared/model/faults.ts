// Injected faults as the grader sees them: is one still there, and what would the bench read without it.
import { copyState } from './copyState'
import { activateSettings } from './injection'
import { inputFunctionKey, type SettingValues } from './settings'
import type { InjectedFault } from './setup'
import { settle } from './settle'
import type { SimState } from './types'

/**
 * The injected fault is still in the circuit (not yet repaired).
 *
 * An input that stopped responding has no repair in the field: its input stage is inside the drive, so
 * the trade either replaces the drive (or its control board) or moves the function to a spare input
 * (the signal rewired to it under isolation, the function assigned to it, the damaged input left with
 * none and the drive tagged for repair). The bench cannot replace a drive, so the fault counts as put
 * right once the dead input carries no function; the input itself stays dead.
 */
export function faultPresent(state: SimState, fault: InjectedFault): boolean {
  switch (fault.kind) {
    case 'brokenWire':
      return state.brokenWires.includes(fault.wireId) && state.wires.some((w) => w.id === fault.wireId)
    case 'blownFuse':
      return state.fuseBlown
    case 'motorConductorOpen':
      return state.motor.openConductors.includes(fault.conductor)
    case 'inputUnresponsive':
      return (
        (state.deadInputs?.includes(fault.input) ?? false) &&
        state.settings.active[inputFunctionKey(fault.input)] !== 'none'
      )
    case 'settingChanged':
      // Until saved back to the value it had before (the model forgets the key then).
      return state.settingsBefore?.[fault.key] !== undefined
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
    case 'inputUnresponsive': {
      const dead = state.deadInputs!.filter((n) => n !== fault.input)
      if (dead.length > 0) draft.deadInputs = dead
      else delete draft.deadInputs
      // A fresh summary object: the input is read again from its terminal's voltage.
      draft.circuit = { ...state.circuit }
      break
    }
    case 'settingChanged': {
      const { [fault.key]: before, ...others } = state.settingsBefore!
      activateSettings(draft, { ...state.settings.active, [fault.key]: before } as SettingValues)
      if (Object.keys(others).length > 0) draft.settingsBefore = others
      else delete draft.settingsBefore
      break
    }
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
