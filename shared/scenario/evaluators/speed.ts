// speedHeld: the motor reached a target speed and stayed within a tolerance band for a duration.
// Between samples the speed is linear (ramps and tracking are piecewise linear and every ramp end is a
// model breakpoint), so the time inside the band is found exactly by interpolation.
import { formatHz, formatRpm, formatSeconds, formatTime } from '../format'
import { folding, type Evaluator } from './types'

interface Point {
  t: number
  v: number
}

interface Stretch {
  from: number
  to: number
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

/** The band followed point by point: the stretch inside it now, and the longest so far. */
interface BandWatch {
  last: Point | undefined
  current: Stretch | null
  best: Stretch | null
}

const NO_BAND: BandWatch = { last: undefined, current: null, best: null }

function stepBand(watch: BandWatch, point: Point, lo: number, hi: number): BandWatch {
  if (!watch.last) return { ...watch, last: point }
  const piece = insideBand(watch.last, point, lo, hi)
  if (!piece) return { last: point, current: null, best: watch.best }
  const { current, best } = watch
  const now =
    current && Math.abs(current.to - piece[0]) < 1e-9
      ? { from: current.from, to: piece[1] }
      : { from: piece[0], to: piece[1] }
  const longer = !best || now.to - now.from > best.to - best.from
  return { last: point, current: now, best: longer ? now : best }
}

/** Longest continuous stretch within [lo, hi] of a piecewise-linear series. */
export function longestInBand(points: Point[], lo: number, hi: number): Stretch | null {
  return points.reduce((watch, point) => stepBand(watch, point, lo, hi), NO_BAND).best
}

interface SpeedWatch {
  band: BandWatch
  /** The first of the highest speeds seen. */
  top: Point | undefined
}

export const speedHeld: Evaluator<'speedHeld'> = (objective) => {
  const rpm = objective.unit === 'rpm'
  const format = rpm ? formatRpm : formatHz
  const lo = objective.target - objective.tolerance
  const hi = objective.target + objective.tolerance
  const band = `${format(lo)} to ${format(hi)}`
  const needMs = objective.holdSeconds * 1000
  return folding<SpeedWatch>(
    { band: NO_BAND, top: undefined },
    (watch, sample) => {
      const point = { t: sample.t, v: rpm ? Math.abs(sample.drive.speedRpm) : sample.drive.outputHz }
      const top = !watch.top || point.v > watch.top.v ? point : watch.top
      return { band: stepBand(watch.band, point, lo, hi), top }
    },
    ({ band: { best }, top }) => {
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
      return {
        met: false,
        evidence: `The motor never came within ${band}; its highest speed was ${format(top!.v)} at ${formatTime(top!.t)}.`,
        at: top!.t,
      }
    },
  )
}
