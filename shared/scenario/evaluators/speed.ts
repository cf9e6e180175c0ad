// speedHeld: the motor reached a target speed and stayed within a tolerance band for a duration.
// Between samples the speed is linear (ramps and tracking are piecewise linear and every ramp end is a
// model breakpoint), so the time inside the band is found exactly by interpolation.
import { formatHz, formatRpm, formatSeconds, formatTime } from '../format'
import type { Evaluator } from './types'

interface Point {
  t: number
  v: number
}

/** When the line through `a` with this slope reaches v. */
function timeAt(a: Point, slope: number, v: number): number {
  return a.t + (v - a.v) / slope
}

/** Sub-interval of [a.t, b.t] where the linear value lies within [lo, hi], or null. */
export function insideBand(a: Point, b: Point, lo: number, hi: number): [number, number] | null {
  if (b.t === a.t) return a.v >= lo && a.v <= hi ? [a.t, a.t] : null
  const slope = (b.v - a.v) / (b.t - a.t)
  if (slope === 0) return a.v >= lo && a.v <= hi ? [a.t, b.t] : null
  // Rising, the line enters the band at lo and leaves it at hi; falling, the other way round.
  const t1 = timeAt(a, slope, slope > 0 ? lo : hi)
  const t2 = timeAt(a, slope, slope > 0 ? hi : lo)
  const from = Math.max(a.t, t1)
  const to = Math.min(b.t, t2)
  return from <= to ? [from, to] : null
}

/** Longest continuous stretch within [lo, hi] of a piecewise-linear series. */
export function longestInBand(points: Point[], lo: number, hi: number): { from: number; to: number } | null {
  let best: { from: number; to: number } | null = null
  let current: { from: number; to: number } | null = null
  for (let i = 1; i < points.length; i++) {
    const piece = insideBand(points[i - 1], points[i], lo, hi)
    if (!piece) {
      current = null
      continue
    }
    if (current && Math.abs(current.to - piece[0]) < 1e-9) current.to = piece[1]
    else current = { from: piece[0], to: piece[1] }
    if (!best || current.to - current.from > best.to - best.from) best = { ...current }
  }
  return best
}

export const speedHeld: Evaluator<'speedHeld'> = (objective, { trace }) => {
  const rpm = objective.unit === 'rpm'
  const value = (s: (typeof trace.samples)[number]) => (rpm ? Math.abs(s.drive.speedRpm) : s.drive.outputHz)
  const format = rpm ? formatRpm : formatHz
  const points = trace.samples.map((s) => ({ t: s.t, v: value(s) }))
  const lo = objective.target - objective.tolerance
  const hi = objective.target + objective.tolerance
  const band = `${format(lo)} to ${format(hi)}`
  const needMs = objective.holdSeconds * 1000
  const best = longestInBand(points, lo, hi)
  if (best && best.to - best.from >= needMs - 1e-6) {
    return {
      met: true,
      evidence: `Held within ${band} from ${formatTime(best.from)} to ${formatTime(best.to)} (${formatSeconds(best.to - best.from)}; ${objective.holdSeconds} s needed).`,
      at: best.from,
    }
  }
  if (best) {
    return {
      met: false,
      evidence: `The longest time within ${band} was ${formatSeconds(best.to - best.from)}, from ${formatTime(best.from)}; ${objective.holdSeconds} s needed.`,
      at: best.from,
    }
  }
  const top = points.reduce((m, p) => (p.v > m.v ? p : m), points[0])
  return {
    met: false,
    evidence: `The motor never came within ${band}; its highest speed was ${format(top.v)} at ${formatTime(top.t)}.`,
    at: top.t,
  }
}
