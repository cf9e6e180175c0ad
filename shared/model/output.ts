// The drive's output to the motor: voltage by V/Hz, and the current and torque the machine's load asks for.
import type { SettingValues } from './settings'
import type { LoadKind, MotorNameplate } from './setup'

/**
 * Output voltage (line to line, RMS fundamental) of a V/Hz drive: proportional to frequency up to the base
 * frequency (the motor's rated frequency setting), then constant at the rated voltage setting
 * (MIL-HDBK-1003/3 appendix D: 460 V at 60 Hz = 7.67 V/Hz, about 230 V at 30 Hz; constant above base is
 * common practice). It cannot exceed the line voltage the drive is fed from. No low-speed boost.
 */
export function vPerHzVolts(hz: number, settings: SettingValues, lineVolts: number): number {
  const baseHz = settings['motor.ratedFrequency']
  const baseVolts = settings['motor.ratedVoltage']
  const f = Math.abs(hz)
  return Math.min(lineVolts, f >= baseHz ? baseVolts : (baseVolts * f) / baseHz)
}

/**
 * Load torque as a fraction of the motor's rated torque at a speed ratio (shaft speed ÷ rated speed):
 * variable torque (fans, centrifugal pumps) rises with the square of speed, constant torque (conveyors,
 * feeders) stays the same (common practice; the fan affinity laws give T ∝ n²).
 */
export function loadTorqueFraction(kind: LoadKind, fractionAtRated: number, speedRatio: number): number {
  return kind === 'variableTorque' ? fractionAtRated * speedRatio ** 2 : fractionAtRated
}

/**
 * Motor current from the nameplate, per unit flux and torque: the full-load current split into its
 * reactive part FLA·sin φ (taken as magnetising, proportional to flux) and its active part FLA·cos φ
 * (torque-producing, proportional to torque ÷ flux): I = FLA·√((ψ·sin φ)² + (τ/ψ·cos φ)²). Rated flux and
 * torque give the full-load current; no load gives FLA·sin φ (about half of FLA for small motors, from
 * memory). A simplified equivalent circuit: no saturation, no acceleration torque.
 */
export function motorAmps(np: MotorNameplate, fluxPu: number, torquePu: number): number {
  const cos = np.powerFactor
  const sin = Math.sqrt(1 - cos * cos)
  const flux = Math.max(fluxPu, 1e-6)
  return np.fullLoadAmps * Math.hypot(flux * sin, (torquePu / flux) * cos)
}

export interface OutputFigures {
  volts: number
  amps: number
  torquePercent: number
}

const OFF: OutputFigures = { volts: 0, amps: 0, torquePercent: 0 }

/** Output voltage, current and torque at an output frequency, with the output stage on or off. */
export function outputFigures(
  hz: number,
  outputOn: boolean,
  settings: SettingValues,
  lineVolts: number,
  np: MotorNameplate,
  load: { loadKind: LoadKind; loadFraction: number },
): OutputFigures {
  if (!outputOn) return OFF
  const f = Math.abs(hz)
  const volts = vPerHzVolts(f, settings, lineVolts)
  // Flux follows V/f against the motor's own rating; at 0 Hz the drive holds its base V/Hz ratio.
  const vPerHz = f > 0 ? volts / f : vPerHzVolts(1, settings, lineVolts)
  const fluxPu = vPerHz / (np.ratedVolts / np.ratedHz)
  const torquePu = loadTorqueFraction(load.loadKind, load.loadFraction, f / np.ratedHz)
  return { volts, amps: motorAmps(np, fluxPu, torquePu), torquePercent: torquePu * 100 }
}
