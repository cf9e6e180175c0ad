// Builds what the scene draws from the model's state and readings plus the panel's own UI state.
import type { CircuitReading, DriveReading, SimState } from '@shared/model/types'
import type { MotorNameplate } from '@shared/model/setup'
import { meterText, statusLamp, statusLines } from './driveDisplay'
import { menuLines, type KeypadMenu } from './keypadMenu'
import type { PointId, ProbeColour, Vec } from './types'
import type { PanelView } from './view'
import { wireLabel } from './wireColours'

export interface PanelUiState {
  selectedWire: string | null
  draftWire: { from: PointId; at: Vec; colour: string } | null
  probeDrag: { probe: ProbeColour; at: Vec } | null
  highlight: PointId | null
  armed: PointId | null
  menu: KeypadMenu
}

export function nameplateLines(np: MotorNameplate): string[] {
  // The scenario's own motor (invented), as its rating plate prints it.
  const connection = np.connection === 'delta' ? 'Δ' : 'Y'
  return [
    `3~ MOTOR  ${np.ratedPower} ${np.powerUnit}  ${np.duty}`,
    `${np.ratedVolts} V ${connection}  ${np.fullLoadAmps} A`,
    `${np.ratedHz} Hz  ${np.ratedRpm} rpm`,
    `cos φ ${np.powerFactor}  eff ${np.efficiencyPercent} %`,
    `serial ${np.serial}`,
  ]
}

export function deriveView(
  sim: SimState,
  drive: DriveReading,
  circuit: CircuitReading,
  ui: PanelUiState,
): PanelView {
  const devices: PanelView['devices'] = {}
  for (const id of sim.deviceOrder) {
    const d = sim.devices[id]
    devices[id] = { held: d.pressed, position: d.position }
  }
  const display =
    ui.menu.screen !== 'status' && drive.displayOn
      ? menuLines(ui.menu, { active: sim.settings.active, pending: sim.settings.pending })
      : statusLines(drive)
  return {
    wires: sim.wires.map((w, i) => ({ ...w, label: wireLabel(w.id, w.colour, i) })),
    selectedWire: ui.selectedWire,
    draftWire: ui.draftWire,
    devices,
    power: { on: sim.power.on, locked: sim.power.locked },
    busVolts: drive.busVolts,
    display,
    lamp: statusLamp(drive),
    inputsOn: circuit.inputs.filter((i) => i.on).map((i) => i.point),
    rpm: drive.motorRpm,
    nameplate: nameplateLines(sim.motor.nameplate),
    probes: { red: sim.meter.red, black: sim.meter.black },
    probeDrag: ui.probeDrag,
    meterText: meterText(circuit.meter),
    meterMode: sim.meter.mode,
    highlight: ui.highlight,
    armed: ui.armed,
  }
}
