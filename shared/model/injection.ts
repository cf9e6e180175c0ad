// Putting an injected fault into a bench: at the start (createSimulation) or mid-attempt (an instructor's
// fault.injected event). Each helper completes a draft nobody else holds; the caller settles it.
import { sendDrive } from './driveTransitions'
import { driveConfig, sameConfig } from './functions'
import {
  crossCheckSettings,
  settingDef,
  validateSetting,
  type SettingKey,
  type SettingValues,
} from './settings'
import type { InjectedFault } from './setup'
import type { DeviceState, SimState } from './types'

const DEVICE_FAULTS = {
  contactFailedOpen: 'failedOpen',
  contactWelded: 'welded',
  wrongContactType: 'wrongType',
} as const satisfies Record<string, DeviceState['fault']>

/** The device-fault state a scenario or instructor fault gives a device's contact. */
export function deviceFaultOf(kind: keyof typeof DEVICE_FAULTS): DeviceState['fault'] {
  return DEVICE_FAULTS[kind]
}

/** New active settings; the drive is reconfigured when its configuration changes (as a save does). */
export function activateSettings(draft: SimState, active: SettingValues): void {
  draft.settings = { ...draft.settings, active }
  const config = driveConfig(active)
  if (!sameConfig(config, draft.drive.context.config))
    draft.drive = sendDrive(draft.drive, { type: 'CONFIGURE', config })
}

/**
 * Why the drive would not take this value as a saved setting now (undefined when it would): the value
 * the catalogue refuses, a clash with the other settings, or a setting that cannot change while turning.
 */
export function settingChangeRefusal(state: SimState, key: SettingKey, value: unknown): string | undefined {
  const check = validateSetting(key, value)
  if (!check.ok) return check.message
  if (state.drive.value.control !== 'stopped' && !settingDef(key).changeWhileRunning)
    return 'it cannot change while the drive is turning'
  const candidate = { ...state.settings.active, [key]: check.value } as SettingValues
  const clash = crossCheckSettings(candidate).find((p) => p.keys.includes(key))
  return clash?.message
}

/**
 * A setting changed behind the apprentice's back: the active value changes as if keyed in and saved, and
 * the value it replaced is kept so the grader knows the repair (saving it back). A value the drive would
 * refuse changes nothing; the apprentice's unsaved edits stay as they were.
 */
function changeSetting(draft: SimState, key: SettingKey, value: unknown): void {
  if (settingChangeRefusal(draft, key, value) !== undefined) return
  const check = validateSetting(key, value)
  if (!check.ok || check.value === draft.settings.active[key]) return
  const before = draft.settingsBefore?.[key] ?? draft.settings.active[key]
  activateSettings(draft, { ...draft.settings.active, [key]: check.value } as SettingValues)
  const { [key]: _replaced, ...others } = draft.settingsBefore ?? {}
  // Changed straight back to the value it had before (a second injection): nothing is wrong any more.
  draft.settingsBefore = check.value === before ? others : { ...others, [key]: before }
  if (Object.keys(draft.settingsBefore).length === 0) delete draft.settingsBefore
}

/** After a save: a setting saved back to the value it had before it was changed is no longer a fault. */
export function forgetRestoredSettings(draft: SimState): SimState {
  const before = draft.settingsBefore
  if (!before) return draft
  const still = Object.fromEntries(
    Object.entries(before).filter(([key, value]) => draft.settings.active[key as SettingKey] !== value),
  )
  if (Object.keys(still).length === Object.keys(before).length) return draft
  if (Object.keys(still).length === 0) delete draft.settingsBefore
  else draft.settingsBefore = still
  return draft
}

/**
 * The bench changes as it would had the fault been there all along. A target that is not on this bench
 * (a wire since removed, a device it does not have) changes nothing.
 */
export function injectFault(draft: SimState, fault: InjectedFault): SimState {
  switch (fault.kind) {
    case 'brokenWire':
      if (draft.wires.some((w) => w.id === fault.wireId) && !draft.brokenWires.includes(fault.wireId))
        draft.brokenWires = [...draft.brokenWires, fault.wireId]
      return draft
    case 'blownFuse':
      draft.fuseBlown = true
      return draft
    case 'motorConductorOpen':
      if (!draft.motor.openConductors.includes(fault.conductor))
        draft.motor = { ...draft.motor, openConductors: [...draft.motor.openConductors, fault.conductor] }
      return draft
    case 'inputUnresponsive':
      if (!draft.deadInputs?.includes(fault.input))
        draft.deadInputs = [...(draft.deadInputs ?? []), fault.input]
      return draft
    case 'settingChanged':
      changeSetting(draft, fault.key, fault.value)
      return draft
    default: {
      const device = draft.devices[fault.device]
      if (!device || device.spec.kind === 'potentiometer') return draft
      // As createSimulation builds it: the block keeps its labelled type and behaves as the other
      // (contactClosed); fitting a block of the labelled type clears it.
      const contact = device.spec.contact ?? device.contact
      draft.devices = {
        ...draft.devices,
        [fault.device]: { ...device, contact, fault: DEVICE_FAULTS[fault.kind] },
      }
      return draft
    }
  }
}
