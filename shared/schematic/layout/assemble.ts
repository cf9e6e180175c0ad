// Heights of rows and channels, then every line, box and text in final coordinates.
import { ASCENT, DESCENT, textWidth, wrapText } from '../text'
import type {
  Box,
  PlacedDevice,
  PlacedStrip,
  PlacedTerminal,
  PlacedText,
  PlacedWire,
  Point,
  SchematicInput,
  SchematicLayout,
  StripId,
  TerminalBar,
  TextKind,
} from '../types'
import {
  CHANNEL_PAD,
  FAN,
  LINE_HEIGHT,
  MARGIN,
  MARKER_H,
  SIZE,
  SYMBOL_H,
  TERMINAL_BOX_H,
  TRACK_PITCH,
  deviceText,
} from './metrics'
import type { Model, RouteNode, RowKind } from './model'
import { chooseLandings } from './landing'
import { channelHeight, type Pin, type Routing } from './route'
import { pinCounts } from './place'

const FRAME_PAD = 6
const LINK_DROP = 7
const MIN_NOTE_WIDTH = 420

export function placedText(
  text: string,
  kind: TextKind,
  x: number,
  y: number,
  size: number,
  bold = false,
  anchor: PlacedText['anchor'] = 'start',
): PlacedText {
  const w = textWidth(text, size, bold)
  const left = anchor === 'start' ? x : anchor === 'middle' ? x - w / 2 : x - w
  return {
    text,
    kind,
    x,
    y,
    anchor,
    size,
    bold,
    box: { x: left, y: y - ASCENT * size, w, h: (ASCENT + DESCENT) * size },
  }
}

/** A one-line text centred in a box (0.35 em below the middle puts the x-height in the middle). */
function centredIn(box: Box, text: string, kind: TextKind, size: number, bold: boolean): PlacedText {
  return placedText(text, kind, box.x + box.w / 2, box.y + box.h / 2 + size * 0.35, size, bold, 'middle')
}

function rowHeight(kind: RowKind, bodyHeight: number): number {
  if (kind === 'supply') return TERMINAL_BOX_H + FAN
  if (kind === 'returns') return FAN + TERMINAL_BOX_H + LINK_DROP + FRAME_PAD
  if (kind === 'inputs') return FAN + TERMINAL_BOX_H + FAN
  return FAN + bodyHeight + FAN
}

function simplify(points: Point[]): Point[] {
  const out: Point[] = []
  for (const p of points) {
    const last = out[out.length - 1]
    if (last && Math.abs(last.x - p.x) < 0.01 && Math.abs(last.y - p.y) < 0.01) continue
    const before = out[out.length - 2]
    if (before && last) {
      const collinear =
        (Math.abs(before.x - last.x) < 0.01 && Math.abs(last.x - p.x) < 0.01) ||
        (Math.abs(before.y - last.y) < 0.01 && Math.abs(last.y - p.y) < 0.01)
      if (collinear) out.pop()
    }
    out.push(p)
  }
  return out
}

const CAPTION_OF: Record<RowKind, keyof SchematicInput['captions']> = {
  supply: 'supply',
  upper: 'devices',
  inputs: 'inputs',
  lower: 'devices',
  returns: 'returns',
}

export function assemble(
  input: SchematicInput,
  model: Model,
  routing: Routing,
  markerTexts: string[],
  spread: number,
): SchematicLayout {
  // Vertical: rows and the channels between them.
  const bodyHeight = Math.max(
    SYMBOL_H,
    ...[...model.deviceObjects.values()].map((o) => deviceText(o.device!.device).height + 12),
  )
  const rowTop: number[] = []
  const rowBottom: number[] = []
  let y = MARGIN
  model.rows.forEach((row, r) => {
    rowTop[r] = y
    y += rowHeight(row.kind, bodyHeight)
    rowBottom[r] = y
    if (r < model.rows.length - 1) y += channelHeight(routing.tracks[r])
  })
  const diagramBottom = y
  const boxTop = (r: number) => (model.rows[r].kind === 'supply' ? rowTop[r] : rowTop[r] + FAN)
  const trackY = (channel: number, track: number) => rowBottom[channel] + CHANNEL_PAD + track * TRACK_PITCH

  // Horizontal: captions in a column of their own, the drawing to their right.
  const captions = model.rows.map((row) => input.captions[CAPTION_OF[row.kind]])
  const captionWidth = Math.max(...captions.map((c) => textWidth(c, SIZE.caption, true)))
  const contentLeft = MARGIN + captionWidth + 16
  const xs: number[] = []
  for (const row of model.rows) for (const o of row.objects) xs.push(o.x - o.left)
  for (const s of routing.segments) {
    xs.push(s.a.x, s.b.x)
    if (s.marker) xs.push(s.marker.x - s.marker.width / 2)
  }
  const shift = contentLeft - Math.min(...xs)
  const X = (x: number) => x + shift

  const texts: PlacedText[] = []
  const counts = pinCounts(model)

  const landings = chooseLandings(model, routing)

  // Drive terminals (wide enough for the wires landing on them) and the dashed frame of each strip.
  const terminals: PlacedTerminal[] = []
  const boxOf = new Map<string, Box>()
  for (const [point, object] of model.terminalObjects) {
    const t = object.terminal!
    const [left, right] = landings.terminalSpan(object).map(X)
    const box = { x: left, y: boxTop(object.row), w: right - left, h: TERMINAL_BOX_H }
    boxOf.set(point, box)
    const c = counts.get(object) ?? { up: 0, down: 0 }
    terminals.push({ point, label: t.label, strip: t.strip, box, pinsUp: c.up, pinsDown: c.down })
    texts.push(centredIn(box, t.label, 'terminal', SIZE.terminal, true))
  }
  const strips: PlacedStrip[] = (['supply', 'inputs', 'returns'] as StripId[]).flatMap((id) => {
    const boxes = terminals.filter((t) => t.strip === id).map((t) => t.box)
    if (boxes.length === 0) return []
    const left = Math.min(...boxes.map((b) => b.x)) - FRAME_PAD
    const right = Math.max(...boxes.map((b) => b.x + b.w)) + FRAME_PAD
    const top = boxes[0].y - FRAME_PAD
    const bottom = boxes[0].y + TERMINAL_BOX_H + (id === 'returns' ? LINK_DROP + FRAME_PAD : FRAME_PAD)
    return [{ id, frame: { x: left, y: top, w: right - left, h: bottom - top } }]
  })
  const internalLinks: Point[][] = input.internalLinks.flatMap((link) => {
    const a = model.terminalObjects.get(link.from)
    const b = model.terminalObjects.get(link.to)
    const boxA = boxOf.get(link.from)
    if (!a || !b || !boxA) return []
    const yBox = boxA.y + boxA.h
    const yLink = yBox + LINK_DROP - 2
    return [
      [
        { x: X(a.x), y: yBox },
        { x: X(a.x), y: yLink },
        { x: X(b.x), y: yLink },
        { x: X(b.x), y: yBox },
      ],
    ]
  })

  // Devices: symbol between two terminal heights, markings beside the terminals, words to the right.
  const devices: PlacedDevice[] = []
  const bars: TerminalBar[] = []
  for (const object of model.deviceObjects.values()) {
    const shape = object.device!
    const d = shape.device
    const top = rowTop[object.row] + FAN
    const bottom = rowBottom[object.row] - FAN
    const axisX = X(object.x)
    const placedTerminals = d.terminals.map((t) => {
      const anchor = shape.anchors.get(t.point)!
      return {
        point: t.point,
        marking: t.marking,
        role: t.role,
        at: { x: axisX + anchor.dx, y: anchor.side === 'up' ? top : bottom },
      }
    })
    for (const t of placedTerminals) {
      if (!t.marking) continue
      const wiper = t.role === 'wiper'
      const x = wiper ? t.at.x - 4 : t.at.x - 7
      const yText = t.at.y === top ? top + 15 : bottom - 5
      texts.push(placedText(t.marking, 'marking', x, yText, SIZE.marking, false, 'end'))
    }
    for (const [side, pins] of landings.pins.get(object) ?? []) {
      if (!landings.straight(pins[0])) continue
      const anchorX = axisX + pins[0].node.anchor.dx
      const xs = pins.map((p) => X(p.x))
      const yBar = side === 'up' ? top : bottom
      if (pins.length === 1 && Math.abs(xs[0] - anchorX) < 0.5) continue
      bars.push({
        from: { x: Math.min(anchorX, ...xs), y: yBar },
        to: { x: Math.max(anchorX, ...xs), y: yBar },
        junctions:
          pins.length > 1 ? xs.filter((x) => Math.abs(x - anchorX) > 0.5).map((x) => ({ x, y: yBar })) : [],
      })
    }
    const words = deviceText(d)
    let yText = (top + bottom) / 2 - words.height / 2
    for (const line of words.nameLines) {
      texts.push(
        placedText(line, 'deviceName', axisX + words.dx, yText + SIZE.deviceName, SIZE.deviceName, true),
      )
      yText += LINE_HEIGHT.name
    }
    for (const line of words.descriptionLines) {
      texts.push(placedText(line, 'deviceText', axisX + words.dx, yText + SIZE.deviceText, SIZE.deviceText))
      yText += LINE_HEIGHT.text
    }
    devices.push({
      key: d.key,
      name: d.name,
      symbol: d.symbol,
      contact: d.contact,
      axisX,
      top,
      bottom,
      flipped: shape.flipped,
      terminals: placedTerminals,
      box: { x: axisX - object.left, y: top, w: object.left + object.right, h: bottom - top },
    })
  }

  // Wires: from one end through every channel and feedthrough to the other.
  const landing = (pin: Pin): Point => {
    const o = pin.node.object
    const side = pin.side
    const y =
      o.kind === 'terminal'
        ? side === 'up'
          ? boxTop(o.row)
          : boxTop(o.row) + TERMINAL_BOX_H
        : side === 'up'
          ? rowTop[o.row] + FAN
          : rowBottom[o.row] - FAN
    const x = o.kind === 'feedthrough' || !landings.straight(pin) ? X(o.x + pin.node.anchor.dx) : X(pin.x)
    return { x, y }
  }
  const pinPoint = (pin: Pin): Point => ({
    x: X(pin.x),
    y: pin.edge === 'top' ? rowBottom[pin.channel] : rowTop[pin.channel + 1],
  })
  const nameOf = (node: RouteNode): string => {
    const point = node.point ?? ''
    const terminal = model.terminalObjects.get(point)?.terminal
    if (terminal) return `Drive ${terminal.label}`
    const shape = node.object.device
    const marking = shape?.device.terminals.find((t) => t.point === point)?.marking
    return shape ? (marking ? `${shape.device.name} ${marking}` : shape.device.name) : ''
  }
  const wires: PlacedWire[] = model.routes.map((route) => {
    const segments = routing.segments.filter((s) => s.route === route)
    const points: Point[] = []
    let markerBox: Box = { x: 0, y: 0, w: 0, h: 0 }
    for (const s of segments) {
      points.push(landing(s.a), pinPoint(s.a))
      if (!s.straight && s.track !== null) {
        const yTrack = trackY(s.channel, s.track)
        points.push({ x: X(s.a.x), y: yTrack }, { x: X(s.b.x), y: yTrack })
      }
      points.push(pinPoint(s.b), landing(s.b))
      if (s.marker) {
        const yMarker =
          s.track === null ? (rowBottom[s.channel] + rowTop[s.channel + 1]) / 2 : trackY(s.channel, s.track)
        markerBox = {
          x: X(s.marker.x) - s.marker.width / 2,
          y: yMarker - MARKER_H / 2,
          w: s.marker.width,
          h: MARKER_H,
        }
      }
    }
    const text = markerTexts[route.index]
    texts.push({ ...centredIn(markerBox, text, 'wireLabel', SIZE.marker, false), box: markerBox })
    const first = route.nodes[0]
    const last = route.nodes[route.nodes.length - 1]
    const forward = first.point === route.wire.from
    return {
      key: route.wire.key,
      number: route.wire.number,
      marker: text,
      colour: route.wire.colour,
      fromName: nameOf(forward ? first : last),
      toName: nameOf(forward ? last : first),
      path: forward ? simplify(points) : simplify(points).reverse(),
      markerBox,
    }
  })

  // Row captions in their column; notes under the drawing.
  model.rows.forEach((_row, r) => {
    texts.push(
      placedText(
        captions[r],
        'caption',
        MARGIN,
        (rowTop[r] + rowBottom[r]) / 2 + SIZE.caption * 0.35,
        SIZE.caption,
        true,
      ),
    )
  })
  const contentRight = Math.max(
    ...model.rows.flatMap((row) => row.objects.map((o) => X(o.x + o.right))),
    ...texts.map((t) => t.box.x + t.box.w),
    ...wires.flatMap((w) => w.path.map((p) => p.x)),
  )
  const noteWidth = Math.max(MIN_NOTE_WIDTH, contentRight - MARGIN)
  let yNote = diagramBottom + 10
  for (const note of input.notes) {
    for (const line of wrapText(note, noteWidth, SIZE.note)) {
      yNote += 15
      texts.push(placedText(line, 'note', MARGIN, yNote, SIZE.note))
    }
  }
  const width = Math.ceil(Math.max(contentRight, MARGIN + noteWidth) + MARGIN)
  const height = Math.ceil(yNote + MARGIN)
  return { width, height, strips, terminals, devices, bars, wires, internalLinks, texts, spread }
}
