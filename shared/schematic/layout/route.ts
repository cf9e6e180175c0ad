// Wires through the channels between rows: each wire end gets its own pin on the channel's edge
// (several wires on one terminal fan out), pins of different wires stay at least one marker apart,
// each wire's run along a channel gets a track of its own (left-edge channel routing), and its marker
// goes where no other wire crosses. Because pins of different wires are never closer than a marker's
// width, such a place always exists.
import { CHANNEL_PAD, MARKER_CLEAR, TRACK_PITCH } from './metrics'
import type { Model, Route, RouteNode, Side } from './model'
import { spreadInOrder } from './spread'

export interface Pin {
  node: RouteNode
  /** Side of the node the pin leaves from. */
  side: Side
  channel: number
  /** The channel's top edge (a pin of the row above) or its bottom edge (the row below). */
  edge: 'top' | 'bottom'
  x: number
}

export interface Segment {
  route: Route
  channel: number
  a: Pin
  b: Pin
  straight: boolean
  /** Track index in the channel, or null for a straight segment without the marker. */
  track: number | null
  marker: { x: number; width: number } | null
}

export interface Routing {
  segments: Segment[]
  /** Tracks per channel. */
  tracks: number[]
}

function pinFor(node: RouteNode, side: Side, x: number): Pin {
  const row = node.object.row
  return side === 'up'
    ? { node, side, channel: row - 1, edge: 'bottom', x }
    : { node, side, channel: row, edge: 'top', x }
}

function buildSegments(model: Model): Segment[] {
  const segments: Segment[] = []
  for (const route of model.routes) {
    for (let i = 0; i + 1 < route.nodes.length; i++) {
      const from = route.nodes[i]
      const to = route.nodes[i + 1]
      const outSide: Side = from.object.kind === 'feedthrough' ? 'down' : from.anchor.side
      const inSide: Side = to.object.kind === 'feedthrough' ? 'up' : to.anchor.side
      const a = pinFor(from, outSide, from.object.x + from.anchor.dx)
      const b = pinFor(to, inSide, to.object.x + to.anchor.dx)
      segments.push({ route, channel: a.channel, a, b, straight: false, track: null, marker: null })
    }
  }
  return segments
}

/** Pins leaving one side of one object, side by side in the order of where they go. */
function fanOut(segments: Segment[], minSep: number): void {
  const groups = new Map<string, { pin: Pin; partner: Pin; order: number }[]>()
  const objectIds = new Map<object, number>()
  segments.forEach((s, order) => {
    for (const [pin, partner] of [
      [s.a, s.b],
      [s.b, s.a],
    ] as const) {
      if (!objectIds.has(pin.node.object)) objectIds.set(pin.node.object, objectIds.size)
      const key = `${objectIds.get(pin.node.object)}:${pin.side}`
      groups.set(key, [...(groups.get(key) ?? []), { pin, partner, order }])
    }
  })
  for (const group of groups.values()) {
    group.sort(
      (p, q) => p.pin.node.anchor.dx - q.pin.node.anchor.dx || p.partner.x - q.partner.x || p.order - q.order,
    )
    const perAnchor = new Map<number, number>()
    for (const g of group) perAnchor.set(g.pin.node.anchor.dx, (perAnchor.get(g.pin.node.anchor.dx) ?? 0) + 1)
    const seen = new Map<number, number>()
    const wishes = group.map((g) => {
      const dx = g.pin.node.anchor.dx
      const j = seen.get(dx) ?? 0
      seen.set(dx, j + 1)
      return g.pin.x + (j - ((perAnchor.get(dx) as number) - 1) / 2) * minSep
    })
    const xs = spreadInOrder(wishes.map((wish, i) => ({ wish, weight: 1, gapBefore: i === 0 ? 0 : minSep })))
    group.forEach((g, i) => (g.pin.x = xs[i]))
  }
}

/** Pins of different wires in one channel at least `minSep` apart; a nearly straight run made straight. */
function separate(segments: Segment[], channel: number, minSep: number): void {
  interface Item {
    pins: Pin[]
    segment: Segment
    wish: number
  }
  const items: Item[] = []
  for (const s of segments) {
    if (s.channel !== channel) continue
    const opposite = s.a.edge !== s.b.edge
    if (opposite && Math.abs(s.a.x - s.b.x) < minSep) {
      items.push({ pins: [s.a, s.b], segment: s, wish: (s.a.x + s.b.x) / 2 })
    } else {
      items.push({ pins: [s.a], segment: s, wish: s.a.x }, { pins: [s.b], segment: s, wish: s.b.x })
    }
  }
  items.sort((p, q) => p.wish - q.wish)
  const xs = spreadInOrder(
    items.map((item, i) => {
      const previous = items[i - 1]
      const sameRun =
        previous && previous.segment === item.segment && previous.pins[0].edge !== item.pins[0].edge
      return { wish: item.wish, weight: item.pins.length, gapBefore: i === 0 || sameRun ? 0 : minSep }
    }),
  )
  items.forEach((item, i) => item.pins.forEach((pin) => (pin.x = xs[i])))
  for (const s of segments) {
    if (s.channel === channel && s.a.edge !== s.b.edge && Math.abs(s.a.x - s.b.x) < 0.5) {
      s.b.x = s.a.x
      s.straight = true
    }
  }
}

/** The segment that carries each wire's marker: its longest run along a channel. */
function chooseMarkerSegments(segments: Segment[]): Set<Segment> {
  const best = new Map<Route, Segment>()
  for (const s of segments) {
    const current = best.get(s.route)
    const run = (x: Segment) => Math.abs(x.a.x - x.b.x)
    if (!current || run(s) > run(current) + 0.5) best.set(s.route, s)
  }
  return new Set(best.values())
}

function interval(s: Segment, markerWidth: number, labelled: boolean): [number, number] {
  const lo = Math.min(s.a.x, s.b.x)
  const hi = Math.max(s.a.x, s.b.x)
  if (!labelled) return [lo, hi]
  const half = markerWidth / 2 + MARKER_CLEAR
  const mid = (lo + hi) / 2
  return [Math.min(lo, mid - half), Math.max(hi, mid + half)]
}

const TRACK_GAP = 6

/** Left-edge channel routing: each run takes the first track free where it starts. */
function assignTracks(list: { segment: Segment; span: [number, number] }[]): number {
  list.sort((p, q) => p.span[0] - q.span[0] || p.span[1] - q.span[1])
  const ends: number[] = []
  for (const item of list) {
    let track = ends.findIndex((end) => end + TRACK_GAP <= item.span[0])
    if (track < 0) {
      track = ends.length
      ends.push(0)
    }
    ends[track] = item.span[1]
    item.segment.track = track
  }
  return ends.length
}

/** Does segment `t` have a vertical line crossing track `k` of its channel, and where? */
function crossings(t: Segment, k: number): number[] {
  if (t.straight) return [t.a.x]
  if (t.track === null) return []
  const xs: number[] = []
  for (const pin of [t.a, t.b]) {
    if (pin.edge === 'top' && k < t.track) xs.push(pin.x)
    if (pin.edge === 'bottom' && k > t.track) xs.push(pin.x)
  }
  return xs
}

function placeMarker(s: Segment, others: Segment[], width: number): number {
  if (s.straight) return s.a.x
  const lo = Math.min(s.a.x, s.b.x)
  const hi = Math.max(s.a.x, s.b.x)
  const k = s.track as number
  const obstacles = [lo, hi, ...others.flatMap((t) => crossings(t, k)).filter((x) => x > lo && x < hi)].sort(
    (p, q) => p - q,
  )
  const mid = (lo + hi) / 2
  let best: number | null = null
  for (let i = 0; i + 1 < obstacles.length; i++) {
    const [left, right] = [obstacles[i], obstacles[i + 1]]
    if (right - left < width + 2 * MARKER_CLEAR) continue
    const centre = Math.min(Math.max(mid, left + width / 2 + MARKER_CLEAR), right - width / 2 - MARKER_CLEAR)
    if (best === null || Math.abs(centre - mid) < Math.abs(best - mid)) best = centre
  }
  return best ?? mid
}

export function routeWires(model: Model, minSep: number, markerWidths: number[]): Routing {
  const segments = buildSegments(model)
  fanOut(segments, minSep)
  const channels = model.rows.length - 1
  for (let c = 0; c < channels; c++) separate(segments, c, minSep)
  const labelled = chooseMarkerSegments(segments)
  const tracks: number[] = []
  for (let c = 0; c < channels; c++) {
    const inChannel = segments.filter((s) => s.channel === c)
    const needTrack = inChannel
      .filter((s) => !s.straight || labelled.has(s))
      .map((segment) => ({
        segment,
        span: interval(segment, markerWidths[segment.route.index], labelled.has(segment)),
      }))
    tracks.push(assignTracks(needTrack))
    for (const s of inChannel) {
      if (!labelled.has(s)) continue
      const width = markerWidths[s.route.index]
      s.marker = {
        x: placeMarker(
          s,
          inChannel.filter((t) => t !== s),
          width,
        ),
        width,
      }
    }
  }
  return { segments, tracks }
}

export function channelHeight(tracks: number): number {
  return tracks === 0 ? 2 * FAN_CLEARANCE : 2 * CHANNEL_PAD + (tracks - 1) * TRACK_PITCH
}
const FAN_CLEARANCE = 10
