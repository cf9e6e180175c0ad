// Where each wire's tag sits on its curve: wires that leave neighbouring screws bunch together, so a
// tag slides along its own curve until it no longer covers a tag placed before it.
import type { Vec } from './types'
import { pointOnCubic, type Cubic } from './wireCurve'

export const WIRE_LABEL_WIDTH = 48
export const WIRE_LABEL_HEIGHT = 16
/** Clear space kept between two tags so their borders do not touch. */
const GAP = 4

/** Curve parameters a tag may use, away from the ends where it would cover the screw. */
const CANDIDATES = Array.from({ length: 15 }, (_, i) => 0.15 + i * 0.05)

/** The lane's usual spot, so tags of wires that do not bunch stay where they always were. */
export function preferredT(lane: number): number {
  return 0.3 + (lane % 5) * 0.1
}

function overlapArea(a: Vec, b: Vec): number {
  const w = WIRE_LABEL_WIDTH + GAP - Math.abs(a.x - b.x)
  const h = WIRE_LABEL_HEIGHT + GAP - Math.abs(a.y - b.y)
  return w > 0 && h > 0 ? w * h : 0
}

/**
 * Centres of the tags, one per curve, in the order given (earlier wires keep their spot). Each tag
 * takes the free candidate nearest its lane's usual spot; if every spot is covered it takes the one
 * with the least overlap.
 */
export function placeWireLabels(wires: readonly { curve: Cubic; lane: number }[]): Vec[] {
  const placed: Vec[] = []
  for (const { curve, lane } of wires) {
    const want = preferredT(lane)
    const order = [want, ...CANDIDATES].sort((a, b) => Math.abs(a - want) - Math.abs(b - want))
    let best = pointOnCubic(curve, want)
    let bestOverlap = Infinity
    for (const t of order) {
      const spot = pointOnCubic(curve, t)
      const overlap = placed.reduce((sum, other) => sum + overlapArea(spot, other), 0)
      if (overlap < bestOverlap) {
        best = spot
        bestOverlap = overlap
      }
      if (overlap === 0) break
    }
    placed.push(best)
  }
  return placed
}
