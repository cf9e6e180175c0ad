// Output frequency and raise/lower reference as closed-form pieces (linear ramps, exponential coast).
import type { ReferencePiece, SpeedPiece } from './types'

/** Below this the coasting motor counts as stopped (common practice for a standstill threshold). */
export const STANDSTILL_HZ = 0.1
/** Values this close are the same (absorbs rounding at breakpoints). */
const SNAP_HZ = 1e-7

/** At or below the standstill threshold (with room for rounding at the breakpoint itself). */
export function isAtStandstill(hz: number): boolean {
  return Math.abs(hz) <= STANDSTILL_HZ + SNAP_HZ
}

export interface RampRates {
  /** Hz per ms when the magnitude of the frequency rises / falls. */
  accel: number
  decel: number
}

export function speedAt(piece: SpeedPiece, t: number, coastTauMs: number): number {
  const dt = t - piece.since
  switch (piece.mode) {
    case 'still':
      return 0
    case 'coast':
      return piece.hz * Math.exp(-dt / coastTauMs)
    default:
      return piece.hz + piece.slope * dt
  }
}

export function referenceAt(piece: ReferencePiece, t: number): number {
  return piece.hz + piece.slope * (t - piece.since)
}

function magnitudeRises(hz: number, slope: number): boolean {
  return hz === 0 ? slope !== 0 : Math.sign(slope) === Math.sign(hz)
}

export type SpeedPlan = 'stopped' | 'coasting' | 'toTarget'

/** The speed piece from `now` on, for the drive's control state and the target line. */
export function planSpeed(
  hzNow: number,
  now: number,
  plan: SpeedPlan,
  targetHz: number,
  targetSlope: number,
  rates: RampRates,
): SpeedPiece {
  const piece: SpeedPiece = { mode: 'still', since: now, hz: 0, slope: 0, targetHz, targetSlope }
  return planSpeedInto(piece, hzNow, now, plan, targetHz, targetSlope, rates.accel, rates.decel)
}

function setPiece(out: SpeedPiece, mode: SpeedPiece['mode'], hz: number, slope: number): SpeedPiece {
  out.mode = mode
  out.hz = hz
  out.slope = slope
  return out
}

/** planSpeed writing into `out` (the settling loop plans into one scratch piece: most plans change nothing). */
export function planSpeedInto(
  out: SpeedPiece,
  hzNow: number,
  now: number,
  plan: SpeedPlan,
  targetHz: number,
  targetSlope: number,
  accel: number,
  decel: number,
): SpeedPiece {
  out.since = now
  out.targetHz = targetHz
  out.targetSlope = targetSlope
  if (plan === 'stopped') return setPiece(out, 'still', 0, 0)
  let hz = Math.abs(hzNow) <= SNAP_HZ ? 0 : hzNow
  if (plan === 'coasting')
    return isAtStandstill(hz) ? setPiece(out, 'still', 0, 0) : setPiece(out, 'coast', hz, 0)
  if (Math.abs(hz - targetHz) <= SNAP_HZ) hz = targetHz
  if (hz === targetHz) {
    if (targetSlope === 0) return setPiece(out, hz === 0 ? 'still' : 'track', hz, 0)
    const allowed = magnitudeRises(hz, targetSlope) ? accel : decel
    if (Math.abs(targetSlope) <= allowed) return setPiece(out, 'track', hz, targetSlope)
    return setPiece(out, 'ramp', hz, Math.sign(targetSlope) * allowed)
  }
  const direction = Math.sign(targetHz - hz)
  const rate = magnitudeRises(hz, direction) ? accel : decel
  return setPiece(out, 'ramp', hz, direction * rate)
}

export type SpeedBreakpoint = { t: number; what: 'speedReached' | 'zeroSpeed' | 'standstill' }

export function nextSpeedBreakpoint(piece: SpeedPiece, coastTauMs: number): SpeedBreakpoint | null {
  if (piece.mode === 'coast') {
    const magnitude = Math.abs(piece.hz)
    return { t: piece.since + coastTauMs * Math.log(magnitude / STANDSTILL_HZ), what: 'standstill' }
  }
  if (piece.mode !== 'ramp') return null
  let best: SpeedBreakpoint | null = null
  const closing = piece.slope - piece.targetSlope
  if (closing !== 0) {
    const dt = (piece.targetHz - piece.hz) / closing
    if (dt > 0) best = { t: piece.since + dt, what: 'speedReached' }
  }
  if (piece.hz !== 0 && !magnitudeRises(piece.hz, piece.slope)) {
    const dt = -piece.hz / piece.slope
    if (dt > 0 && (!best || piece.since + dt < best.t)) best = { t: piece.since + dt, what: 'zeroSpeed' }
  }
  return best
}

/** Whether the output frequency's magnitude is rising, falling or steady on this piece. */
export function trendOf(piece: SpeedPiece): 'up' | 'down' | 'steady' {
  if (piece.mode === 'still' || piece.slope === 0) return piece.mode === 'coast' ? 'down' : 'steady'
  return magnitudeRises(piece.hz, piece.slope) ? 'up' : 'down'
}

/** Deceleration rate (Hz per ms, ≥ 0) the piece asks of the motor; 0 when not slowing down. */
export function decelerationOf(piece: SpeedPiece): number {
  if (
    (piece.mode === 'ramp' || piece.mode === 'track') &&
    piece.slope !== 0 &&
    !magnitudeRises(piece.hz, piece.slope)
  ) {
    return Math.abs(piece.slope)
  }
  return 0
}

export function nextReferenceLimit(piece: ReferencePiece, min: number, max: number): number | null {
  if (piece.slope > 0) return piece.since + Math.max(0, max - piece.hz) / piece.slope
  if (piece.slope < 0) return piece.since + Math.max(0, piece.hz - min) / -piece.slope
  return null
}
