// A shallow copy of a simulation state, field by field: the copy made for each step (one per event).
// Faster than a spread on this hot path; keeps the key order of createSimulation (JSON stays identical).
import type { SimState } from './types'

export function copyState(s: SimState): SimState {
  const copy: SimState = {
    t: s.t,
    devices: s.devices,
    deviceOrder: s.deviceOrder,
    wires: s.wires,
    brokenWires: s.brokenWires,
    fuseBlown: s.fuseBlown,
    power: s.power,
    lineVolts: s.lineVolts,
    machine: s.machine,
    motor: s.motor,
    settings: s.settings,
    meter: s.meter,
    inputs: s.inputs,
    raiseLowerFirst: s.raiseLowerFirst,
    drive: s.drive,
    circuit: s.circuit,
    bus: s.bus,
    speed: s.speed,
    reference: s.reference,
    messages: s.messages,
  }
  // Fields only a bench with those faults has: absent otherwise, so other states keep their shape.
  if (s.deadInputs) copy.deadInputs = s.deadInputs
  if (s.settingsBefore) copy.settingsBefore = s.settingsBefore
  if (s.injected) copy.injected = s.injected
  return copy
}
