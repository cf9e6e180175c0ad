// The scenario's starting state taken from a simulation (the author's set-up on the panel, #17).
//
// Pure: what the panel holds now, read back into the scenario format. The opposite of
// toSimulationSetup, so toSimulationSetup(start) → createSimulation → here gives `start` again.
// What the panel cannot change (line voltage, the machine, the motor's nameplate, the supervisor's
// name) comes from `previous`; the motor cable and the supervisor's lock only when the state changed them.
import { DEFAULT_SETTINGS, STRAIGHT_CABLE } from '../model'
import type { DeviceSpec, MotorCable } from '../model/setup'
import type { SimState } from '../model/types'
import type { StartingState } from './schema'

const sameCable = (a: MotorCable, b: MotorCable) => a.u === b.u && a.v === b.v && a.w === b.w

type StartDevice = StartingState['devices'][number]

function deviceSpec(state: SimState, id: string): StartDevice {
  const device = state.devices[id]!
  const spec: DeviceSpec = { ...device.spec }
  // A contact block the author fitted (the model keeps a faulty block apart, as a fault).
  if (device.contact !== (spec.contact ?? 'NO')) spec.contact = device.contact
  if (device.position !== (spec.position ?? 0)) spec.position = device.position
  // The model checked the spec against the scenario's own device rules when the simulation was made.
  return spec as StartDevice
}

/**
 * The saved settings to list: every one listed before (with its value now, so an explicit value stays
 * explicit), and any other that differs from the catalogue default. A setting changed by an injected
 * fault counts at the value it had before the fault; pending (unsaved) edits are not part of it.
 */
function savedSettings(state: SimState, previous: StartingState): StartingState['settings'] {
  const active: Record<string, unknown> = { ...state.settings.active, ...state.settingsBefore }
  const defaults = DEFAULT_SETTINGS as Record<string, unknown>
  const settings: StartingState['settings'] = {}
  for (const [key, value] of Object.entries(active)) {
    const listed = Object.hasOwn(previous.settings, key)
    if (listed || value !== defaults[key]) settings[key] = value as StartingState['settings'][string]
  }
  return settings
}

export function startingStateFromSimulation(state: SimState, previous: StartingState): StartingState {
  const power: StartingState['power'] = { on: state.power.on, locked: state.power.locked }
  // The supervisor's lock stays as the story names it; only its removal shows in the state.
  if (state.power.supervisorLock && previous.power.supervisorLock)
    power.supervisorLock = { ...previous.power.supervisorLock }
  else if (state.power.supervisorLock) power.supervisorLock = { name: state.power.supervisorLock.name }

  const start: StartingState = {
    devices: state.deviceOrder.map((id) => deviceSpec(state, id)),
    wires: state.wires.map((w) => ({ id: w.id, from: w.from, to: w.to, colour: w.colour })),
    settings: savedSettings(state, previous),
    power,
  }
  if (previous.lineVolts !== undefined) start.lineVolts = previous.lineVolts
  if (previous.machine !== undefined) start.machine = structuredClone(previous.machine)
  if (previous.motor !== undefined) start.motor = structuredClone(previous.motor)
  const cableBefore = previous.motorCable ?? STRAIGHT_CABLE
  if (!sameCable(state.motor.cable, cableBefore)) start.motorCable = { ...state.motor.cable }
  else if (previous.motorCable !== undefined) start.motorCable = { ...previous.motorCable }
  return start
}
