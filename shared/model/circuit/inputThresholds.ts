// IEC 61131-2 limits for 24 V DC type 1 digital inputs (figures in the team's REFERENCES.md,
// secondary sources Infineon KBA236229 and TI SLVAG20).

export const TYPE1_LIMITS = {
  /** OFF: U ≤ 5 V, or I ≤ 0.5 mA (the "or" reading is from memory). */
  offMaxVolts: 5,
  offMaxMilliamps: 0.5,
  /** ON: U ≥ 15 V and I ≥ 2 mA. */
  onMinVolts: 15,
  onMinMilliamps: 2,
} as const

export type InputRegion = 'off' | 'transition' | 'on'

export function inputRegion(volts: number, milliamps: number): InputRegion {
  if (volts <= TYPE1_LIMITS.offMaxVolts || milliamps <= TYPE1_LIMITS.offMaxMilliamps) return 'off'
  if (volts >= TYPE1_LIMITS.onMinVolts && milliamps >= TYPE1_LIMITS.onMinMilliamps) return 'on'
  return 'transition'
}

/**
 * An input in the transition band keeps its previous state: common practice for inputs with
 * hysteresis (the standard leaves the band undefined; real input circuits add hysteresis there).
 */
export function nextInputState(previous: boolean, region: InputRegion): boolean {
  if (region === 'on') return true
  if (region === 'off') return false
  return previous
}
