// Everything the scene draws, as plain data. The wrapper derives it from the model's readings;
// the scene never reads the model itself.
import type { MeterMode, PointId, ProbeColour, Vec } from './types'

export interface ViewWire {
  id: string
  from: PointId
  to: PointId
  colour: string
  label: string
}

export type StatusLamp = 'off' | 'charging' | 'ready' | 'running' | 'alarm' | 'fault'

export interface PanelView {
  wires: ViewWire[]
  selectedWire: string | null
  /** Rubber-band wire while dragging from a terminal. */
  draftWire: { from: PointId; at: Vec; colour: string } | null
  /** Pushbutton held, selector position, potentiometer position (0..1). */
  devices: Record<string, { held?: boolean; position?: number }>
  power: { on: boolean; locked: boolean }
  busVolts: number
  /** Status display lines, already formatted. */
  display: string[]
  lamp: StatusLamp
  /** Drive terminals whose input is ON (lit indicator beside the terminal). */
  inputsOn: PointId[]
  rpm: number
  nameplate: string[]
  probes: { red: PointId | null; black: PointId | null }
  /** While a probe is being dragged, where its tip is. */
  probeDrag: { probe: ProbeColour; at: Vec } | null
  meterText: string
  /** Where the meter's function selector points (the apprentice turns it). */
  meterMode: MeterMode
  /** Terminal under the pointer or focused by keyboard, highlighted. */
  highlight: PointId | null
  /** First terminal of a wire drawn tap by tap, waiting for the second. */
  armed: PointId | null
}

export function emptyView(): PanelView {
  return {
    wires: [],
    selectedWire: null,
    draftWire: null,
    devices: {},
    power: { on: false, locked: false },
    busVolts: 0,
    display: ['', '', '', ''],
    lamp: 'off',
    inputsOn: [],
    rpm: 0,
    nameplate: [],
    probes: { red: null, black: null },
    probeDrag: null,
    meterText: '---',
    meterMode: 'off',
    highlight: null,
    armed: null,
  }
}
