// Motor nameplates: the figures derived from one, the checks that its figures agree, and a default
// bench motor for setups that declare none.
import { slipFraction, synchronousRpm } from './motor'
import type { SettingValues } from './settings'
import type { MotorNameplate } from './setup'

/**
 * 1 hp (mechanical) = 550 ft·lbf/s = 745.699 87 W (NIST SP 811, appendix B.8), from the exact foot
 * (0.3048 m) and pound-force (4.448 221 615 260 5 N).
 */
export const WATTS_PER_HP = 550 * 0.3048 * 4.4482216152605

/**
 * Usual line voltages by supply frequency (trade pairs, from memory): 400 V 50 Hz and 460 V 60 Hz are
 * the common ones; a motor rated 400 V at 60 Hz is unusual and is refused.
 */
export const TRADE_VOLTAGES: Record<50 | 60, readonly number[]> = {
  50: [220, 230, 380, 400, 415, 500, 690],
  60: [208, 220, 230, 380, 440, 460, 575, 600],
}

/** How far P = √3·V·I·cos φ·η may differ from the rated output (rounded plate figures). */
export const POWER_TOLERANCE = 0.05
/** Largest rated slip accepted (small motors slip the most; common practice, from memory). */
export const MAX_RATED_SLIP = 0.08

export function ratedWatts(np: MotorNameplate): number {
  return np.powerUnit === 'kW' ? np.ratedPower * 1000 : np.ratedPower * WATTS_PER_HP
}

/**
 * Output from the electrical figures: P = √3·V_L·I_L·cos φ·η, three-phase input power times efficiency
 * (electric-motor formula tables, e.g. the Contractors Unlimited technical toolbox; US DOE motor systems
 * sourcebook, from memory).
 */
export function wattsFromElectricalFigures(np: MotorNameplate): number {
  return Math.sqrt(3) * np.ratedVolts * np.fullLoadAmps * np.powerFactor * (np.efficiencyPercent / 100)
}

/**
 * Pole count implied by the rated speed: the synchronous speed 120·f/p is the first one above the rated
 * speed (n = 120·f/p, handbook formula), so p = 2 × floor(60·f / n).
 */
export function nameplatePoles(np: Pick<MotorNameplate, 'ratedHz' | 'ratedRpm'>): number {
  return 2 * Math.max(1, Math.floor((60 * np.ratedHz) / np.ratedRpm))
}

/**
 * Line-to-line winding resistance as an ohmmeter reads it across two motor terminals. Either connection
 * gives the same relation: stator copper loss = 1.5 · I_L² · R_LL (star: 3·I²·R_ph with R_LL = 2·R_ph;
 * delta: 3·(I/√3)²·R_ph with R_LL = ⅔·R_ph). The copper loss is taken as 40 % of the full-load losses
 * P·(1/η − 1) — a typical share for small induction motors (from memory).
 */
export function windingOhms(np: MotorNameplate): number {
  const losses = ratedWatts(np) * (100 / np.efficiencyPercent - 1)
  return (0.4 * losses) / (1.5 * np.fullLoadAmps ** 2)
}

export interface NameplateProblem {
  field: keyof MotorNameplate
  message: string
}

/** Figures on one plate that disagree with each other (empty when the plate is consistent). */
export function nameplateProblems(np: MotorNameplate): NameplateProblem[] {
  const problems: NameplateProblem[] = []
  if (!TRADE_VOLTAGES[np.ratedHz].includes(np.ratedVolts)) {
    problems.push({
      field: 'ratedVolts',
      message: `${np.ratedVolts} V is not a usual supply voltage at ${np.ratedHz} Hz (usual: ${TRADE_VOLTAGES[np.ratedHz].join(', ')} V).`,
    })
  }
  const poles = nameplatePoles(np)
  const synchronous = synchronousRpm(np.ratedHz, poles)
  const slip = slipFraction(np.ratedHz, poles, np.ratedRpm)
  if (slip <= 0 || slip > MAX_RATED_SLIP) {
    problems.push({
      field: 'ratedRpm',
      message: `Rated speed ${np.ratedRpm} rpm must be a little below a synchronous speed (nearest: ${synchronous} rpm with ${poles} poles at ${np.ratedHz} Hz; slip at most ${MAX_RATED_SLIP * 100} %).`,
    })
  }
  const rated = ratedWatts(np)
  const electrical = wattsFromElectricalFigures(np)
  if (Math.abs(electrical / rated - 1) > POWER_TOLERANCE) {
    problems.push({
      field: 'fullLoadAmps',
      message: `√3 × ${np.ratedVolts} V × ${np.fullLoadAmps} A × cos φ ${np.powerFactor} × ${np.efficiencyPercent} % = ${(electrical / 1000).toFixed(2)} kW, but the rated output is ${(rated / 1000).toFixed(2)} kW.`,
    })
  }
  return problems
}

/**
 * The bench motor of a setup that declares no nameplate: built from the drive's motor settings so the two
 * agree (power factor 0.82 and efficiency 87 %, typical of a few-kW motor, from memory).
 */
export function nameplateFromSettings(settings: SettingValues): MotorNameplate {
  const powerFactor = 0.82
  const efficiencyPercent = 87
  const volts = settings['motor.ratedVoltage']
  const amps = settings['motor.ratedCurrent']
  const kw = (Math.sqrt(3) * volts * amps * powerFactor * (efficiencyPercent / 100)) / 1000
  return {
    serial: 'BENCH-0000',
    ratedVolts: volts,
    ratedHz: settings['motor.ratedFrequency'],
    ratedPower: Math.round(kw * 100) / 100,
    powerUnit: 'kW',
    fullLoadAmps: amps,
    powerFactor,
    efficiencyPercent,
    connection: 'star',
    ratedRpm: settings['motor.ratedSpeed'],
    duty: 'S1',
  }
}
