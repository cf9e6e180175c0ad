// Wires are cubic Bézier curves that leave both terminals downward, so they hang below the strip
// and never cross the labels printed above the screws.
import type { Vec } from './types'

export interface Cubic {
  p0: Vec
  p1: Vec
  p2: Vec
  p3: Vec
}

/** `lane` staggers the sag of wires that would otherwise lie on top of each other. */
export function wireCurve(from: Vec, to: Vec, lane = 0): Cubic {
  const span = Math.abs(to.x - from.x)
  const sag = Math.min(150, 34 + span * 0.22) + (lane % 5) * 9
  return {
    p0: from,
    p1: { x: from.x, y: from.y + sag },
    p2: { x: to.x, y: to.y + sag },
    p3: to,
  }
}

export function pointOnCubic(c: Cubic, t: number): Vec {
  const u = 1 - t
  const a = u * u * u
  const b = 3 * u * u * t
  const d = 3 * u * t * t
  const e = t * t * t
  return {
    x: a * c.p0.x + b * c.p1.x + d * c.p2.x + e * c.p3.x,
    y: a * c.p0.y + b * c.p1.y + d * c.p2.y + e * c.p3.y,
  }
}

export function sampleCubic(c: Cubic, segments = 24): Vec[] {
  const points: Vec[] = []
  for (let i = 0; i <= segments; i++) points.push(pointOnCubic(c, i / segments))
  return points
}

function distanceToSegment(p: Vec, a: Vec, b: Vec): number {
  const dx = b.x - a.x
  const dy = b.y - a.y
  const len2 = dx * dx + dy * dy
  const t = len2 === 0 ? 0 : Math.max(0, Math.min(1, ((p.x - a.x) * dx + (p.y - a.y) * dy) / len2))
  return Math.hypot(p.x - (a.x + t * dx), p.y - (a.y + t * dy))
}

/** Shortest distance from a point to the drawn curve (polyline approximation, well under a pixel). */
export function distanceToCubic(c: Cubic, p: Vec, segments = 32): number {
  const pts = sampleCubic(c, segments)
  let best = Infinity
  for (let i = 1; i < pts.length; i++) best = Math.min(best, distanceToSegment(p, pts[i - 1], pts[i]))
  return best
}
