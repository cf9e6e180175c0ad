// Motor nameplate arithmetic: synchronous speed, slip and shaft speed from output frequency.

/** n_s = 120·f/p (rpm), the handbook formula for an induction motor's synchronous speed. */
export function synchronousRpm(frequencyHz: number, poles: number): number {
  return (120 * frequencyHz) / poles
}

/** Rated slip as a fraction: s = (n_s − n) / n_s. */
export function slipFraction(ratedFrequencyHz: number, poles: number, ratedRpm: number): number {
  const ns = synchronousRpm(ratedFrequencyHz, poles)
  return (ns - ratedRpm) / ns
}

/**
 * Shaft speed at an output frequency: synchronous speed minus the rated slip in rpm, scaled with
 * frequency (constant slip fraction) and never below zero. A simple steady-state view at rated load —
 * the motor model has no torque or load estimate, so slip is assumed to be the rated slip fraction
 * (common practice for a V/Hz drive display without slip compensation).
 */
export function shaftRpm(
  frequencyHz: number,
  poles: number,
  ratedFrequencyHz: number,
  ratedRpm: number,
): number {
  const s = slipFraction(ratedFrequencyHz, poles, ratedRpm)
  return synchronousRpm(frequencyHz, poles) * (1 - s)
}

/** The output frequency that gives a shaft speed (inverse of shaftRpm). */
export function frequencyForRpm(
  rpm: number,
  poles: number,
  ratedFrequencyHz: number,
  ratedRpm: number,
): number {
  const s = slipFraction(ratedFrequencyHz, poles, ratedRpm)
  return (rpm * poles) / (120 * (1 - s))
}
