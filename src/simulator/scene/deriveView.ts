// Builds what the scene draws from the model's state and readings plus the panel's own UI state.
import type { CircuitReading, DriveReading, FrontPanelReading, SimState } from '@shared/model/types'
import type { LockTag, MotorNameplate } from '@shared/model/setup'
import { readFrontPanel } from '@shared/model/frontPanel'
import { frontPanelLines, meterText, statusLamp } from './driveDisplay'
import { menuLines, statusPage, type KeypadMenu } from './keypadMenu'
import type { PointId, ProbeColour, Vec } from './types'
import type { PanelView, PowerView } from './view'
import { wireLabel } from './wireColours'

export interface PanelUiState {
  selectedWire: string | null
  draftWire: { from: PointId; at: Vec; colour: string } | null
  probeDrag: { probe: ProbeColour; at: Vec } | null
  highlight: PointId | null
  armed: PointId | null
  menu: KeypadMenu
  /**
   * A replay of a log written before tags: the tag as the attempt's owner would have written it (their
   * name, the attempt's date). A tag in the log always wins.
   */
  tagFallback?: LockTag | null
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

/**
 * The drive display's four lines: the keypad menu, or the status screen's page. Only what the drive's
 * front panel shows (readFrontPanel): nothing on a dark display, no voltages beyond its own readouts.
 */
export function displayLines(sim: SimState, panel: FrontPanelReading, menu: KeypadMenu): string[] {
  return menu.screen !== 'status' && panel.lit
    ? menuLines(menu, { active: sim.settings.active, pending: sim.settings.pending })
    : frontPanelLines(panel, statusPage(menu))
}

/** The disconnect as drawn: on or off, and each lock on it with its tag (the apprentice's own first). */
export function powerView(power: SimState['power'], tagFallback: LockTag | null = null): PowerView {
  return {
    on: power.on,
    locked: power.locked,
    tag: power.locked ? (power.tag ?? tagFallback) : null,
    supervisorLock: power.supervisorLock ?? null,
  }
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
  const panel = readFrontPanel(sim, drive)
  const display = displayLines(sim, panel, ui.menu)
  return {
    wires: sim.wires.map((w, i) => ({ ...w, label: wireLabel(w.id, w.colour, i) })),
    selectedWire: ui.selectedWire,
    draftWire: ui.draftWire,
    devices,
    power: powerView(sim.power, ui.tagFallback ?? null),
    display,
    lamp: statusLamp(panel),
    chargeLamp: panel.chargeLamp,
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
