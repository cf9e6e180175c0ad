// DC bus voltage in closed form: a linear pre-charge, then two exponential discharges.

/** Six-pulse rectifier average: V_dc = 3·√2/π · V_line ≈ 1.35 · V_line (power-electronics textbooks). */
export function nominalBusVolts(lineVolts: number): number {
  return ((3 * Math.SQRT2) / Math.PI) * lineVolts
}

/** Pre-charge from 0 V to nominal takes this long; linear (the contract asks for piecewise linear). */
export const CHARGE_MS = 1500
/**
 * Below this fraction of nominal the switch-mode supply of the electronics stops: keypad dark,
 * +24 V and +10 V off (common practice; the figure is ours). The bus is still lethal then.
 */
export const CONTROL_ON_FRACTION = 0.55
/** Discharge time constant while the electronics still draw from the bus (ours). */
export const LOADED_TAU_MS = 4000
/**
 * Discharge through the bleed resistors once the electronics are off: 100 s, so the bus takes about
 * three minutes to fall below 50 V — several minutes, as drive warning labels state (common practice;
 * IEC 60204-1 6.2.4 asks for a warning when it takes longer than 5 s).
 */
export const IDLE_TAU_MS = 100_000
/** Hazard threshold for "bus discharged" (NEC 460.6: 50 V; IEC 60204-1 6.2.4: 60 V). */
export const SAFE_BUS_VOLTS = 50

export interface BusPieceLike {
  mode: 'charging' | 'steady' | 'decayLoaded' | 'decayIdle'
  since: number
  volts: number
  controlOn: boolean
}

export function busVoltsAt(piece: BusPieceLike, t: number, lineVolts: number): number {
  const dt = t - piece.since
  const nominal = nominalBusVolts(lineVolts)
  switch (piece.mode) {
    case 'steady':
      return nominal
    case 'charging':
      return Math.min(nominal, piece.volts + (nominal / CHARGE_MS) * dt)
    case 'decayLoaded':
      return piece.volts * Math.exp(-dt / LOADED_TAU_MS)
    case 'decayIdle':
      return piece.volts * Math.exp(-dt / IDLE_TAU_MS)
  }
}

export type BusBreakpoint = { t: number; what: 'controlOn' | 'busCharged' | 'controlOff' }

/** When the current piece ends, if it does. */
export function nextBusBreakpoint(piece: BusPieceLike, lineVolts: number): BusBreakpoint | null {
  const nominal = nominalBusVolts(lineVolts)
  const threshold = CONTROL_ON_FRACTION * nominal
  if (piece.mode === 'charging') {
    const rate = nominal / CHARGE_MS
    if (!piece.controlOn && piece.volts < threshold) {
      return { t: piece.since + (threshold - piece.volts) / rate, what: 'controlOn' }
    }
    return { t: piece.since + Math.max(0, nominal - piece.volts) / rate, what: 'busCharged' }
  }
  if (piece.mode === 'decayLoaded') {
    return {
      t: piece.since + LOADED_TAU_MS * Math.log(Math.max(1, piece.volts / threshold)),
      what: 'controlOff',
    }
  }
  return null
}

export function controlThresholdVolts(lineVolts: number): number {
  return CONTROL_ON_FRACTION * nominalBusVolts(lineVolts)
}
