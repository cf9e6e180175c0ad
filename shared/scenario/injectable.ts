// The catalogue an instructor picks from to put a fault into a running bench (live classroom): only what is
// on this bench now, named as the panel names it, nothing already faulted. Words only: no id reaches a screen.
import { OUTPUT_PHASES, faultPresent, type DeviceState, type InjectedFault, type SimState } from '../model'
import { contactWords } from '../schematic/markings'
import { conductorName, contactName, pointName, wireName } from './names'

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
    return [
      { fault: open, label: `Fail the contact open: ${name}`, group },
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

/** Every fault an instructor may put into this bench as it is now, grouped, in the dialog's order. */
export function injectableFaults(state: SimState): InjectableFault[] {
  return [...wireFaults(state), ...deviceFaults(state), ...supplyFaults(state), ...cableFaults(state)]
}
