// layoutSchematic(input): the whole drawing in coordinates. A fixed-rail ladder (rows for the drive's
// supply, devices, inputs and 0 V; channels between them) rather than a general graph-layout library:
// the trade's conventions fix where everything goes, it runs synchronously in the browser and the PDF,
// and markers clear of every other line and text follow from the construction (route.ts), checked below.
import type { Box, PlacedWire, SchematicInput, SchematicLayout } from '../types'
import { assemble } from './assemble'
import { MARKER_CLEAR, markerWidth } from './metrics'
import { WIPER_DX, buildModel, type Model } from './model'
import { placeObjects } from './place'
import { routeWires } from './route'

export function boxesOverlap(a: Box, b: Box, clearance = 0): boolean {
  return (
    a.x < b.x + b.w + clearance &&
    b.x < a.x + a.w + clearance &&
    a.y < b.y + b.h + clearance &&
    b.y < a.y + a.h + clearance
  )
}

/** Does the segment p–q (horizontal, vertical or slanted) pass through the box? */
export function segmentHitsBox(p: { x: number; y: number }, q: { x: number; y: number }, box: Box): boolean {
  // Liang–Barsky clipping of the segment against the box.
  let t0 = 0
  let t1 = 1
  const dx = q.x - p.x
  const dy = q.y - p.y
  const edges: [number, number][] = [
    [-dx, p.x - box.x],
    [dx, box.x + box.w - p.x],
    [-dy, p.y - box.y],
    [dy, box.y + box.h - p.y],
  ]
  for (const [pp, qq] of edges) {
    if (pp === 0) {
      if (qq < 0) return false
      continue
    }
    const r = qq / pp
    if (pp < 0) t0 = Math.max(t0, r)
    else t1 = Math.min(t1, r)
    if (t0 > t1) return false
  }
  return t1 - t0 > 1e-6
}

/** Problems a reader would see: texts on texts, markers on other wires. Empty when the drawing is clean. */
export function layoutProblems(layout: SchematicLayout): string[] {
  const problems: string[] = []
  const { texts } = layout
  for (let i = 0; i < texts.length; i++) {
    for (let j = i + 1; j < texts.length; j++) {
      if (boxesOverlap(texts[i].box, texts[j].box))
        problems.push(`"${texts[i].text}" overlaps "${texts[j].text}"`)
    }
  }
  const crosses = (wire: PlacedWire, box: Box) =>
    wire.path.some((p, i) => i > 0 && segmentHitsBox(wire.path[i - 1], p, box))
  for (const wire of layout.wires) {
    for (const other of layout.wires) {
      if (other !== wire && crosses(other, wire.markerBox)) {
        problems.push(`wire ${other.marker} runs under the marker of ${wire.marker}`)
      }
    }
  }
  return problems
}

/** A potentiometer's wiper goes on the side its wire leaves towards, so it does not cross the low end's. */
function orientWipers(model: Model): void {
  for (const object of model.deviceObjects.values()) {
    const shape = object.device!
    if (shape.device.symbol !== 'potentiometer') continue
    const wiper = shape.device.terminals.find((t) => t.role === 'wiper')
    const bottom = [...shape.anchors].find(([point, a]) => a.side === 'down' && point !== wiper?.point)
    if (!wiper || !bottom) continue
    const partners = (point: string) =>
      model.routes.flatMap((route) =>
        route.nodes.flatMap((node, i) => {
          if (node.object !== object || node.point !== point) return []
          const next = route.nodes[i + 1] ?? route.nodes[i - 1]
          return next ? [next.object.x + next.anchor.dx] : []
        }),
      )
    const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length
    const [w, low] = [partners(wiper.point), partners(bottom[0])]
    if (w.length > 0 && low.length > 0 && mean(w) < mean(low)) {
      // Route nodes share this anchor object, so change it in place.
      const anchor = shape.anchors.get(wiper.point)
      if (anchor) anchor.dx = -WIPER_DX
    }
  }
}

const MAX_TRIES = 6
const GROW = 16

export function layoutSchematic(input: SchematicInput): SchematicLayout {
  const markers = input.wires.map((w) => `${w.number} ${w.colour.code}`)
  const widths = markers.map(markerWidth)
  let minSep = Math.max(40, ...widths) + 2 * MARKER_CLEAR + 6
  let layout: SchematicLayout | null = null
  for (let attempt = 0; attempt < MAX_TRIES; attempt++) {
    const model = buildModel(input)
    placeObjects(model, minSep)
    orientWipers(model)
    const routing = routeWires(model, minSep, widths)
    layout = assemble(input, model, routing, markers, minSep)
    if (layoutProblems(layout).length === 0) return layout
    minSep += GROW
  }
  return layout as SchematicLayout
}
