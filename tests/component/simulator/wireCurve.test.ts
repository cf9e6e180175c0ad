// Wire curves: they start and end on the terminals and hang below the strip, away from the labels.
import { describe, expect, it } from 'vitest'
import { distanceToCubic, pointOnCubic, sampleCubic, wireCurve } from '@/simulator/scene/wireCurve'

describe('a wire curve', () => {
  const a = { x: 100, y: 400 }
  const b = { x: 400, y: 400 }
  const c = wireCurve(a, b)

  it('starts and ends on its terminals', () => {
    expect(pointOnCubic(c, 0)).toEqual(a)
    expect(pointOnCubic(c, 1)).toEqual(b)
  })

  it('has the textbook midpoint B(1/2) = (P0 + 3P1 + 3P2 + P3) / 8', () => {
    // Standard Bernstein-form identity for cubic Bézier curves (e.g. Farin, "Curves and Surfaces for CAGD"; from memory).
    const m = pointOnCubic(c, 0.5)
    expect(m.x).toBeCloseTo((c.p0.x + 3 * c.p1.x + 3 * c.p2.x + c.p3.x) / 8, 9)
    expect(m.y).toBeCloseTo((c.p0.y + 3 * c.p1.y + 3 * c.p2.y + c.p3.y) / 8, 9)
  })

  it('never rises above the terminal strip, where the labels are', () => {
    for (const p of sampleCubic(c, 50)) expect(p.y).toBeGreaterThanOrEqual(400)
  })

  it('separates parallel wires into lanes', () => {
    const lane0 = pointOnCubic(wireCurve(a, b, 0), 0.5)
    const lane1 = pointOnCubic(wireCurve(a, b, 1), 0.5)
    expect(lane1.y).toBeGreaterThan(lane0.y + 4)
  })

  it('measures the distance from a point to the curve', () => {
    expect(distanceToCubic(c, pointOnCubic(c, 0.3))).toBeLessThan(0.5)
    expect(distanceToCubic(c, { x: 250, y: 300 })).toBeGreaterThan(50)
  })
})
