// Sizes of everything drawn, in SVG px (1 px = 0.75 pt when printed at 100 %).
import { textWidth, wrapText } from '../text'
import type { SchematicDevice } from '../types'

export const SIZE = {
  marker: 11,
  terminal: 12,
  deviceName: 12,
  deviceText: 11,
  marking: 11,
  caption: 12,
  note: 11,
} as const

export const MARGIN = 16
/** Height of the slanted part where several wires meet one terminal. */
export const FAN = 14
export const TERMINAL_BOX_H = 22
/** Least height of a device symbol between its two terminals. */
export const SYMBOL_H = 64
/** Left of a device's axis: actuator and terminal markings. */
export const SYMBOL_LEFT = 38
export const MARKER_H = 16
export const MARKER_PAD = 4
/** Clear space kept around a wire marker. */
export const MARKER_CLEAR = 4
export const TRACK_PITCH = 22
export const CHANNEL_PAD = 14
export const OBJECT_GAP = 10
const DEVICE_TEXT_WIDTH = 170

export function markerWidth(text: string): number {
  return textWidth(text, SIZE.marker) + 2 * MARKER_PAD
}

export interface DeviceText {
  nameLines: string[]
  descriptionLines: string[]
  /** Where the text starts, right of the axis. */
  dx: number
  width: number
  height: number
}

const NAME_LINE = 15
const TEXT_LINE = 14

export function deviceText(device: SchematicDevice): DeviceText {
  const nameLines = wrapText(device.name, DEVICE_TEXT_WIDTH, SIZE.deviceName, true)
  const descriptionLines = wrapText(device.description, DEVICE_TEXT_WIDTH, SIZE.deviceText)
  const width = Math.max(
    ...nameLines.map((l) => textWidth(l, SIZE.deviceName, true)),
    ...descriptionLines.map((l) => textWidth(l, SIZE.deviceText)),
  )
  const dx = device.symbol === 'potentiometer' ? 30 : 18
  return {
    nameLines,
    descriptionLines,
    dx,
    width,
    height: nameLines.length * NAME_LINE + descriptionLines.length * TEXT_LINE,
  }
}

export const LINE_HEIGHT = { name: NAME_LINE, text: TEXT_LINE }

export function terminalBoxWidth(label: string): number {
  return Math.max(30, textWidth(label, SIZE.terminal, true) + 12)
}
