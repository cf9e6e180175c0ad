// Plain data shared by the panel's layout, hit-testing, interaction and drawing (no Pixi here).
import type { MeterMode } from '@shared/model/meterModes'
export type PointId = string

export interface Vec {
  x: number
  y: number
}

export interface Rect {
  x: number
  y: number
  w: number
  h: number
}

export type TerminalGroup = 'control' | 'power' | 'device' | 'prover'

export interface TerminalSpot {
  id: PointId
  label: string
  /** Accessible description, e.g. "Drive terminal DI1 (digital input 1)". */
  name: string
  /** Short title for lists, e.g. "DI1" or "Faster 13". */
  title: string
  x: number
  y: number
  group: TerminalGroup
  /** Control and device terminals take wires; power terminals are for the meter only. */
  wireable: boolean
}

export type DeviceKind = 'pushbutton' | 'selector' | 'potentiometer'

export interface PanelDevice {
  id: string
  kind: DeviceKind
  label: string
  contact?: 'NO' | 'NC'
}

export interface DeviceSpot {
  id: string
  kind: DeviceKind
  label: string
  contact?: 'NO' | 'NC'
  rect: Rect
  /** Where the pointer operates the device (button cap, selector knob, pot dial). */
  actuator: { x: number; y: number; r: number }
  terminals: PointId[]
}

export type KeypadKey = 'run' | 'stop' | 'reset' | 'up' | 'down' | 'left' | 'right' | 'enter' | 'back'

export interface KeySpot {
  key: KeypadKey
  label: string
  rect: Rect
}

export interface PanelLayout {
  width: number
  height: number
  terminals: Record<PointId, TerminalSpot>
  devices: DeviceSpot[]
  drive: { rect: Rect; display: Rect; keys: KeySpot[]; statusLamp: Vec; controlStrip: Rect; powerStrip: Rect }
  disconnect: { rect: Rect; handle: Rect; lock: Rect }
  motor: { rect: Rect; shaft: Vec; shaftRadius: number; nameplate: Rect }
  /** The meter proving unit: a known live source for the live–dead–live check (meter only, never wired). */
  prover: { rect: Rect }
  meter: {
    rect: Rect
    display: Rect
    holsters: { red: Vec; black: Vec }
    /** The function selector: one button per position, as printed on the meter. */
    selector: { mode: MeterMode; rect: Rect }[]
  }
  station: Rect
  /** The band below the terminal strips where wires run. */
  wireway: Rect
}

export type ProbeColour = 'red' | 'black'
export type { MeterMode }
