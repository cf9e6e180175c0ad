// The drawing's skeleton: rows top to bottom (drive supply, devices fed from it, drive inputs, devices
// returning to 0 V, drive 0 V), the objects in each row, and each wire's route through the channels
// between rows. Coordinates come later (place.ts, route.ts, assemble.ts).
import type { SchematicDevice, SchematicInput, SchematicTerminal, SchematicWire, StripId } from '../types'

export type RowKind = 'supply' | 'upper' | 'inputs' | 'lower' | 'returns'
export type Side = 'up' | 'down'

/** Where a wire lands on an object, relative to the object's axis. */
export interface Anchor {
  dx: number
  side: Side
}

export interface RowObject {
  row: number
  kind: 'terminal' | 'device' | 'feedthrough'
  terminal?: SchematicTerminal
  device?: DeviceShape
  /** A feedthrough carries one wire past a row. */
  wire?: number
  /** Extents of the body from the axis (pins are added by place.ts). */
  left: number
  right: number
  x: number
  /** Order in the row. */
  key: number
}

export interface DeviceShape {
  device: SchematicDevice
  /** The second terminal (b, or the low end) drawn on top. */
  flipped: boolean
  anchors: Map<string, Anchor>
}

export interface RouteNode {
  object: RowObject
  /** For an end: where the wire lands. A feedthrough passes straight through its axis. */
  anchor: Anchor
  point?: string
}

export interface Route {
  index: number
  wire: SchematicWire
  /** From the end nearer the top to the other, through one feedthrough per row passed. */
  nodes: RouteNode[]
}

export interface Model {
  rows: { kind: RowKind; objects: RowObject[] }[]
  routes: Route[]
  terminalObjects: Map<string, RowObject>
  deviceObjects: Map<string, RowObject>
}

const STRIP_ROWS: Record<StripId, RowKind> = { supply: 'supply', inputs: 'inputs', returns: 'returns' }

/** Which device terminal each point is, for the device that has it. */
function deviceOfPoint(devices: readonly SchematicDevice[]): Map<string, SchematicDevice> {
  const map = new Map<string, SchematicDevice>()
  for (const d of devices) for (const t of d.terminals) if (!map.has(t.point)) map.set(t.point, d)
  return map
}

/**
 * A device goes in the upper row when the drive's supply reaches it in fewer wires than the drive's
 * 0 V (sink wiring, potentiometers, anything unconnected); else in the lower row (source wiring).
 */
function deviceBands(input: SchematicInput): Map<string, 'upper' | 'lower'> {
  const neighbours = new Map<string, string[]>()
  const link = (a: string, b: string) => {
    neighbours.set(a, [...(neighbours.get(a) ?? []), b])
    neighbours.set(b, [...(neighbours.get(b) ?? []), a])
  }
  for (const w of input.wires) link(w.from, w.to)
  for (const d of input.devices) for (const t of d.terminals.slice(1)) link(d.terminals[0].point, t.point)
  const distances = (strip: StripId) => {
    const start = input.terminals.filter((t) => t.strip === strip).map((t) => t.point)
    const dist = new Map(start.map((p) => [p, 0]))
    const queue = [...start]
    while (queue.length > 0) {
      const p = queue.shift() as string
      for (const q of neighbours.get(p) ?? []) {
        if (!dist.has(q)) {
          dist.set(q, (dist.get(p) as number) + 1)
          queue.push(q)
        }
      }
    }
    return dist
  }
  const fromSupply = distances('supply')
  const fromReturns = distances('returns')
  const bands = new Map<string, 'upper' | 'lower'>()
  for (const d of input.devices) {
    const near = (dist: Map<string, number>) =>
      Math.min(...d.terminals.map((t) => dist.get(t.point) ?? Infinity))
    bands.set(d.key, near(fromReturns) < near(fromSupply) ? 'lower' : 'upper')
  }
  return bands
}

export const WIPER_DX = 18
export const OTHER_TERMINAL_PITCH = 18

/** Anchors of a device's terminals, the first of a contact on top unless flipping saves feedthroughs. */
function deviceAnchors(
  device: SchematicDevice,
  flipped: boolean,
  otherRow: (point: string) => number[],
  row: number,
): Map<string, Anchor> {
  const anchors = new Map<string, Anchor>()
  const byRole = (role: string) => device.terminals.find((t) => t.role === role)
  if (device.symbol === 'pushbutton' || device.symbol === 'selector') {
    const a = byRole('contactA') ?? device.terminals[0]
    const b = byRole('contactB') ?? device.terminals[1]
    const [top, bottom] = flipped ? [b, a] : [a, b]
    if (top) anchors.set(top.point, { dx: 0, side: 'up' })
    if (bottom) anchors.set(bottom.point, { dx: 0, side: 'down' })
  } else if (device.symbol === 'potentiometer') {
    const hi = byRole('high')
    const lo = byRole('low')
    const wiper = byRole('wiper')
    const [top, bottom] = flipped ? [lo, hi] : [hi, lo]
    if (top) anchors.set(top.point, { dx: 0, side: 'up' })
    if (bottom) anchors.set(bottom.point, { dx: 0, side: 'down' })
    if (wiper) anchors.set(wiper.point, { dx: WIPER_DX, side: 'down' })
  } else if (device.symbol === 'looseEnd') {
    const t = device.terminals[0]
    const rows = otherRow(t.point)
    const above = rows.filter((r) => r < row).length
    anchors.set(t.point, { dx: 0, side: above >= rows.length - above ? 'up' : 'down' })
  } else {
    device.terminals.forEach((t, i) => {
      anchors.set(
        t.point,
        i === 0 ? { dx: 0, side: 'up' } : { dx: (i - 1) * OTHER_TERMINAL_PITCH, side: 'down' },
      )
    })
  }
  return anchors
}

/** Wire ends that would have to double back (an end on top wired to something below, and vice versa). */
function turnBacks(anchors: Map<string, Anchor>, otherRow: (point: string) => number[], row: number): number {
  let cost = 0
  for (const [point, anchor] of anchors) {
    for (const r of otherRow(point)) {
      if (anchor.side === 'up' && r > row) cost++
      if (anchor.side === 'down' && r < row) cost++
    }
  }
  return cost
}

export function buildModel(input: SchematicInput): Model {
  const bands = deviceBands(input)
  const kinds: RowKind[] = ['supply']
  if (input.devices.some((d) => bands.get(d.key) === 'upper')) kinds.push('upper')
  kinds.push('inputs')
  if (input.devices.some((d) => bands.get(d.key) === 'lower')) kinds.push('lower')
  kinds.push('returns')
  const rowOf = (kind: RowKind) => kinds.indexOf(kind)
  const rows: Model['rows'] = kinds.map((kind) => ({ kind, objects: [] }))

  const terminalObjects = new Map<string, RowObject>()
  input.terminals.forEach((terminal, i) => {
    const row = rowOf(STRIP_ROWS[terminal.strip])
    const object: RowObject = { row, kind: 'terminal', terminal, left: 0, right: 0, x: 0, key: i }
    rows[row].objects.push(object)
    terminalObjects.set(terminal.point, object)
  })

  const deviceRow = new Map(input.devices.map((d) => [d.key, rowOf(bands.get(d.key) ?? 'upper')]))
  const owner = deviceOfPoint(input.devices)
  const rowOfPoint = (point: string): number | undefined => {
    const t = terminalObjects.get(point)
    if (t) return t.row
    const d = owner.get(point)
    return d ? deviceRow.get(d.key) : undefined
  }
  const otherRows = (point: string): number[] =>
    input.wires.flatMap((w) => {
      const other = w.from === point ? w.to : w.to === point ? w.from : undefined
      const r = other === undefined ? undefined : rowOfPoint(other)
      return r === undefined ? [] : [r]
    })

  const deviceObjects = new Map<string, RowObject>()
  input.devices.forEach((device, i) => {
    const row = deviceRow.get(device.key) as number
    let anchors = deviceAnchors(device, false, otherRows, row)
    let flipped = false
    const flippable = device.symbol !== 'looseEnd' && device.symbol !== 'other'
    if (flippable) {
      const alternative = deviceAnchors(device, true, otherRows, row)
      if (turnBacks(alternative, otherRows, row) < turnBacks(anchors, otherRows, row)) {
        anchors = alternative
        flipped = true
      }
    }
    const object: RowObject = {
      row,
      kind: 'device',
      device: { device, flipped, anchors },
      left: 0,
      right: 0,
      x: 0,
      key: i,
    }
    rows[row].objects.push(object)
    deviceObjects.set(device.key, object)
  })

  const endOf = (point: string, otherPoint: string): RouteNode => {
    const terminal = terminalObjects.get(point)
    if (terminal) {
      const otherRow = rowOfPoint(otherPoint) ?? terminal.row
      const kind = rows[terminal.row].kind
      const side: Side =
        kind === 'supply' ? 'down' : kind === 'returns' ? 'up' : otherRow > terminal.row ? 'down' : 'up'
      return { object: terminal, anchor: { dx: 0, side }, point }
    }
    const device = deviceObjects.get((owner.get(point) as SchematicDevice).key) as RowObject
    return { object: device, anchor: (device.device as DeviceShape).anchors.get(point) as Anchor, point }
  }

  const channelOf = (node: RouteNode) => (node.anchor.side === 'up' ? node.object.row - 1 : node.object.row)
  const routes: Route[] = input.wires.map((wire, index) => {
    let a = endOf(wire.from, wire.to)
    let b = endOf(wire.to, wire.from)
    if (channelOf(a) > channelOf(b)) [a, b] = [b, a]
    const nodes: RouteNode[] = [a]
    for (let row = channelOf(a) + 1; row <= channelOf(b); row++) {
      const object: RowObject = { row, kind: 'feedthrough', wire: index, left: 0, right: 0, x: 0, key: 0 }
      rows[row].objects.push(object)
      nodes.push({ object, anchor: { dx: 0, side: 'up' } })
    }
    nodes.push(b)
    return { index, wire, nodes }
  })

  return { rows, routes, terminalObjects, deviceObjects }
}
