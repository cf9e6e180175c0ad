// Everything the scene draws, as plain data. The wrapper derives it from the model's readings;
// the scene never reads the model itself.
import type { LockTag, SupervisorLock } from '@shared/model/setup'
import type { MeterMode, PointId, ProbeColour, Vec } from './types'

export interface ViewWire {
  id: string
  from: PointId
  to: PointId
  colour: string
  label: string
}

/** The disconnect: its position and the locks on it, each with what its tag says. */
export interface PowerView {
  on: boolean
  /** The apprentice's own lock. */
  locked: boolean
  /** What the apprentice wrote on their tag (null when the log recorded none: an older attempt). */
  tag: LockTag | null
  /** Someone else's lock from the scenario's story. */
  supervisorLock: SupervisorLock | null
}

export type StatusLamp = 'off' | 'charging' | 'ready' | 'running' | 'alarm' | 'fault'

export interface PanelView {
  wires: ViewWire[]
  selectedWire: string | null
  /** Rubber-band wire while dragging from a terminal. */
  draftWire: { from: PointId; at: Vec; colour: string } | null
  /** Pushbutton held, selector position, potentiometer position (0..1). */
  devices: Record<string, { held?: boolean; position?: number }>
  power: PowerView
  /** Status display lines, already formatted. */
  display: string[]
  lamp: StatusLamp
  /** CHARGE lamp: the DC bus is above its threshold (lit or dark display). */
  chargeLamp: boolean
  /** How fast the shaft turns (drawn as its rotation only: a motor prints no speed). */
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
    power: { on: false, locked: false, tag: null, supervisorLock: null },
    display: ['', '', '', ''],
    lamp: 'off',
    chargeLamp: false,
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
