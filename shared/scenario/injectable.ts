// The catalogue an instructor picks from to put a fault into a running bench (live classroom): only what is
// on this bench now, named as the panel names it, nothing already faulted. Words only: no id reaches a screen.
import {
  DIGITAL_INPUT_NUMBERS,
  OUTPUT_PHASES,
  faultPresent,
  inputFunctionKey,
  settingChangeRefusal,
  settingDef,
  type DeviceState,
  type InjectedFault,
  type SettingKey,
  type SettingValue,
  type SimState,
} from '../model'
import { contactWords } from '../schematic/markings'
import {
  conductorName,
  contactName,
  inputFunctionName,
  pointName,
  settingName,
  settingValueName,
  wireName,
} from './names'

export interface InjectableFault {
  fault: InjectedFault
  /** What the instructor picks, in words: "Break wire W4 (DI1 to Run / stop terminal 14)". */
  label: string
  /** Where the dialog lists it: "Wiring", "Field devices", … */
  group: string
}

/** Groups in the order the dialog lists them. */
export const INJECTABLE_GROUPS = {
  wiring: 'Wiring',
  devices: 'Field devices',
  supply: 'Control supply',
  motorCable: 'Motor cable',
  inputs: 'Drive inputs',
  settings: 'Settings',
  external: 'External fault',
} as const

function wireFaults(state: SimState): InjectableFault[] {
  return state.wires.flatMap((wire, index) => {
    const fault: InjectedFault = { kind: 'brokenWire', wireId: wire.id }
    if (faultPresent(state, fault)) return []
    const number = wireName(wire.id, state) ?? `W${index + 1}`
    const label = `Break wire ${number} (${pointName(wire.from, state)} to ${pointName(wire.to, state)})`
    return [{ fault, label, group: INJECTABLE_GROUPS.wiring }]
  })
}

/**
 * The input assigned the external-fault function that this device's contact is wired straight to, if any.
 * An external fault is the monitoring contact of outside equipment opening (the drive trips while that
 * input is OFF): on this bench that is the contact wired to that input failing open, so the catalogue
 * offers it under its own name only where such a contact is fitted. A bench without one has no way to
 * show an external fault truthfully, and none is offered.
 */
function externalFaultInput(state: SimState, deviceId: string): number | undefined {
  const contact = [`${deviceId}.a`, `${deviceId}.b`]
  for (const input of DIGITAL_INPUT_NUMBERS) {
    if (state.settings.active[inputFunctionKey(input)] !== 'externalFault') continue
    const point = `drive.di${input}`
    const wired = state.wires.some(
      (w) => (contact.includes(w.from) && w.to === point) || (contact.includes(w.to) && w.from === point),
    )
    if (wired) return input
  }
  return undefined
}

/** A device is offered only while none of the contact faults is on it (nor a block other than its label's). */
function deviceFaults(state: SimState): InjectableFault[] {
  return state.deviceOrder.flatMap((id) => {
    const device: DeviceState | undefined = state.devices[id]
    if (!device || device.spec.kind === 'potentiometer') return []
    const open: InjectedFault = { kind: 'contactFailedOpen', device: id }
    if (faultPresent(state, open)) return []
    const name = contactName(id, state)
    const labelled = device.spec.contact ?? 'NO'
    const inside = labelled === 'NO' ? 'NC' : 'NO'
    const group = INJECTABLE_GROUPS.devices
    const external = externalFaultInput(state, id)
    return [
      external
        ? {
            fault: open,
            label: `Trip the external interlock: ${name} opens (it feeds ${pointName(`drive.di${external}`, state)}, "${inputFunctionName('externalFault')}")`,
            group: INJECTABLE_GROUPS.external,
          }
        : { fault: open, label: `Fail the contact open: ${name}`, group },
      { fault: { kind: 'contactWelded', device: id }, label: `Weld the contact closed: ${name}`, group },
      {
        fault: { kind: 'wrongContactType', device: id },
        label: `Fit a wrong contact block: ${name} (labelled ${contactWords(labelled)}, works ${contactWords(inside)})`,
        group,
      },
    ]
  })
}

function supplyFaults(state: SimState): InjectableFault[] {
  const fault: InjectedFault = { kind: 'blownFuse' }
  if (faultPresent(state, fault)) return []
  return [{ fault, label: 'Blow the control fuse', group: INJECTABLE_GROUPS.supply }]
}

function cableFaults(state: SimState): InjectableFault[] {
  return OUTPUT_PHASES.flatMap((conductor) => {
    const fault: InjectedFault = { kind: 'motorConductorOpen', conductor }
    if (faultPresent(state, fault)) return []
    const label = `Break conductor ${conductorName(conductor)} inside the motor cable`
    return [{ fault, label, group: INJECTABLE_GROUPS.motorCable }]
  })
}

/** Each input that does something now (a dead input with no function would show nothing). */
function inputFaults(state: SimState): InjectableFault[] {
  return DIGITAL_INPUT_NUMBERS.flatMap((input) => {
    const fn = state.settings.active[inputFunctionKey(input)]
    const fault: InjectedFault = { kind: 'inputUnresponsive', input }
    if (fn === 'none' || state.deadInputs?.includes(input)) return []
    const label = `Make input ${pointName(`drive.di${input}`, state)} stop responding (it is "${inputFunctionName(String(fn))}" now)`
    return [{ fault, label, group: INJECTABLE_GROUPS.inputs }]
  })
}

/** Choice settings an instructor may switch to each other option: the ones a wrong value shows up in. */
const CHOICE_KEYS: readonly SettingKey[] = [
  'control.source',
  'inputs.logic',
  'reference.remoteSource',
  'stop.mode',
  'relay.function',
]

/** The other values offered for a setting now: each other option, an input's function taken away, a number halved or doubled. */
function otherValues(state: SimState, key: SettingKey): SettingValue[] {
  const def = settingDef(key)
  const now = state.settings.active[key]
  if (def.kind === 'choice' && key.endsWith('.function')) return now === 'none' ? [] : ['none']
  if (def.kind === 'choice') return def.options.map((o) => o.value as SettingValue).filter((v) => v !== now)
  if (def.kind === 'boolean') return [!now]
  const value = now as number
  return [Math.max(def.min, Math.round(value / 2)), Math.min(def.max, value * 2)].filter((v) => v !== value)
}

function settingFaults(state: SimState): InjectableFault[] {
  const keys: SettingKey[] = [
    ...CHOICE_KEYS,
    ...DIGITAL_INPUT_NUMBERS.map(inputFunctionKey),
    'speed.max',
    'ramp.accelSeconds',
    'ramp.decelSeconds',
  ]
  return keys.flatMap((key) => {
    // A setting already changed behind their back is not changed again until they put it back.
    if (state.settingsBefore?.[key] !== undefined) return []
    const now = state.settings.active[key]
    return otherValues(state, key)
      .filter((value) => settingChangeRefusal(state, key, value) === undefined)
      .map((value) => ({
        fault: { kind: 'settingChanged', key, value } as InjectedFault,
        label: `Change ${settingName(key)} from ${settingValueName(key, now)} to ${settingValueName(key, value)}`,
        group: INJECTABLE_GROUPS.settings,
      }))
  })
}

/** Every fault an instructor may put into this bench as it is now, grouped, in the dialog's order. */
export function injectableFaults(state: SimState): InjectableFault[] {
  return [
    ...wireFaults(state),
    ...deviceFaults(state),
    ...supplyFaults(state),
    ...cableFaults(state),
    ...inputFaults(state),
    ...settingFaults(state),
  ]
}
