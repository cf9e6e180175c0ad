// What the schematic renderer takes (a plain description of the bench's wiring) and what its layout
// returns (geometry and every text with its box, so tests and the PDF can reason about it).
import type { WireColourMarking } from './markings'

/** The three places the drive's control terminals are drawn: supply at the top, 0 V at the bottom. */
export type StripId = 'supply' | 'inputs' | 'returns'

export interface SchematicTerminal {
  point: string
  /** As printed on the drive and the panel, e.g. "DI1". */
  label: string
  strip: StripId
}

export type DeviceSymbol = 'pushbutton' | 'selector' | 'potentiometer' | 'looseEnd' | 'other'

export type DeviceTerminalRole = 'contactA' | 'contactB' | 'high' | 'wiper' | 'low' | 'other'

export interface SchematicDeviceTerminal {
  point: string
  /** Printed beside the terminal, e.g. "13". */
  marking: string
  role: DeviceTerminalRole
}

export interface SchematicDevice {
  /** Internal key (never drawn). */
  key: string
  /** The device's name as labelled on the bench, e.g. "Infeed run / stop". */
  name: string
  symbol: DeviceSymbol
  contact?: 'NO' | 'NC'
  /** Plain description drawn under the name, e.g. "Pushbutton, normally open". */
  description: string
  terminals: SchematicDeviceTerminal[]
}

export interface SchematicWire {
  /** Internal key (never drawn). */
  key: string
  /** e.g. "W3". */
  number: string
  colour: WireColourMarking
  from: string
  to: string
}

/** A connection inside the drive, drawn dashed (e.g. analog common joined to 0 V). */
export interface InternalLink {
  from: string
  to: string
}

export interface SchematicInput {
  terminals: SchematicTerminal[]
  devices: SchematicDevice[]
  wires: SchematicWire[]
  internalLinks: InternalLink[]
  /** Row captions (plain words), by row kind. */
  captions: { supply: string; devices: string; inputs: string; returns: string }
  /** Lines printed under the drawing. */
  notes: string[]
}

export interface Point {
  x: number
  y: number
}

export interface Box {
  x: number
  y: number
  w: number
  h: number
}

export type TextKind = 'wireLabel' | 'terminal' | 'deviceName' | 'deviceText' | 'marking' | 'caption' | 'note'

export interface PlacedText {
  text: string
  kind: TextKind
  /** Anchor point: baseline, aligned by `anchor`. */
  x: number
  y: number
  anchor: 'start' | 'middle' | 'end'
  size: number
  bold: boolean
  /** The box the text covers (from the font's advance widths, ascender to descender). */
  box: Box
}

export interface PlacedWire {
  key: string
  number: string
  /** Marker text, e.g. "W3 BU". */
  marker: string
  colour: WireColourMarking
  /** Plain names of both ends, e.g. "Drive +24" and "Infeed run / stop 13". */
  fromName: string
  toName: string
  /** Orthogonal in the channels, short slanted fans at terminals; from `from` to `to`. */
  path: Point[]
  /** The marker's box (also listed in `texts`). */
  markerBox: Box
}

export interface PlacedTerminal {
  point: string
  label: string
  strip: StripId
  box: Box
  /** Whether wires leave from the top and/or the bottom edge. */
  pinsUp: number
  pinsDown: number
}

export interface PlacedDeviceTerminal {
  point: string
  marking: string
  role: DeviceTerminalRole
  at: Point
}

export interface PlacedDevice {
  key: string
  name: string
  symbol: DeviceSymbol
  contact?: 'NO' | 'NC'
  /** Axis of the symbol and its top and bottom terminal heights. */
  axisX: number
  top: number
  bottom: number
  /** True when the symbol is drawn upside down (its second terminal on top). */
  flipped: boolean
  terminals: PlacedDeviceTerminal[]
  /** Everything the device covers, text included. */
  box: Box
}

/** Where several wires land on one device terminal: a short bar through the terminal, a dot per wire. */
export interface TerminalBar {
  from: Point
  to: Point
  junctions: Point[]
}

export interface PlacedStrip {
  id: StripId
  /** Dashed frame around the strip's terminals. */
  frame: Box
}

export interface SchematicLayout {
  width: number
  height: number
  strips: PlacedStrip[]
  terminals: PlacedTerminal[]
  devices: PlacedDevice[]
  bars: TerminalBar[]
  wires: PlacedWire[]
  /** Dashed connections inside the drive. */
  internalLinks: Point[][]
  /** Every text drawn, wire markers included. */
  texts: PlacedText[]
  /** Gaps between pins that the layout had to widen before every marker found a clear place. */
  spread: number
}
