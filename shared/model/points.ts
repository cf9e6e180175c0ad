// Terminal (point) ids of the drive and of field devices, and which are part of the control network.

export const DIGITAL_INPUT_NUMBERS = [1, 2, 3, 4, 5, 6] as const
export type DigitalInputNumber = (typeof DIGITAL_INPUT_NUMBERS)[number]

export const DRIVE_CONTROL_POINTS = [
  'drive.p24',
  'drive.0v',
  'drive.dcom',
  'drive.di1',
  'drive.di2',
  'drive.di3',
  'drive.di4',
  'drive.di5',
  'drive.di6',
  'drive.p10',
  'drive.ai',
  'drive.acom',
  'drive.k1a',
  'drive.k1b',
] as const
export type DriveControlPoint = (typeof DRIVE_CONTROL_POINTS)[number]

/**
 * Power terminals: reachable by the meter only (never wired in the simulator). L1–L3 are the incoming
 * line after the disconnect, U, V, W the drive's output to the motor cable, PE the protective earth.
 */
export const DRIVE_POWER_POINTS = [
  'drive.l1',
  'drive.l2',
  'drive.l3',
  'drive.dcp',
  'drive.dcn',
  'drive.pe',
  'drive.u',
  'drive.v',
  'drive.w',
] as const
export type DrivePowerPoint = (typeof DRIVE_POWER_POINTS)[number]

/** The drive's three output terminals, in phase order; the motor cable's conductors start on them. */
export const OUTPUT_PHASES = ['u', 'v', 'w'] as const
export type OutputPhase = (typeof OUTPUT_PHASES)[number]

/**
 * The motor's terminal box: U1, V1, W1 (IEC 60034-8 terminal markings), where the cable's conductors
 * land. Meter only, like the drive's power terminals.
 */
export const MOTOR_POINTS = ['motor.u1', 'motor.v1', 'motor.w1'] as const
export type MotorPoint = (typeof MOTOR_POINTS)[number]
export const MOTOR_TERMINALS = ['u1', 'v1', 'w1'] as const
export type MotorTerminal = (typeof MOTOR_TERMINALS)[number]

/**
 * A meter proving unit on the bench: a known live source to check the meter on before and after a dead
 * test (live–dead–live, NFPA 70E 120.5(7)). It is battery-powered, so it is live whatever the disconnect
 * does. Two outputs against one common terminal (`prover.neg`): DC on `prover.pos` for the V DC range,
 * AC on `prover.ac` for the V AC range — a meter is checked on the range it will test with.
 */
export const PROVER_POINTS = ['prover.pos', 'prover.neg', 'prover.ac'] as const
export type ProverPoint = (typeof PROVER_POINTS)[number]
/** The proving unit's DC test voltage (our figure; proving units commonly offer 50–690 V, from memory). */
export const PROVER_VOLTS = 110
/** The proving unit's AC test voltage, RMS (our figure, in the same band). */
export const PROVER_AC_VOLTS = 230

export function isProverPoint(point: PointId): point is ProverPoint {
  return point === 'prover.pos' || point === 'prover.neg' || point === 'prover.ac'
}

export function isMotorPoint(point: PointId): point is MotorPoint {
  return point === 'motor.u1' || point === 'motor.v1' || point === 'motor.w1'
}

export type PointId = string

/**
 * Terminal labels printed on the panel. Our own markings where a maker's would otherwise creep in: DIC is
 * the digital-input common, AIC the analog-input common (named after the inputs they serve).
 */
export const POINT_LABELS: Record<DriveControlPoint | DrivePowerPoint | MotorPoint, string> = {
  'drive.p24': '+24',
  'drive.0v': '0V',
  'drive.dcom': 'DIC',
  'drive.di1': 'DI1',
  'drive.di2': 'DI2',
  'drive.di3': 'DI3',
  'drive.di4': 'DI4',
  'drive.di5': 'DI5',
  'drive.di6': 'DI6',
  'drive.p10': '+10',
  'drive.ai': 'AI',
  'drive.acom': 'AIC',
  'drive.k1a': 'K1A',
  'drive.k1b': 'K1B',
  'drive.l1': 'L1',
  'drive.l2': 'L2',
  'drive.l3': 'L3',
  'drive.dcp': 'DC+',
  'drive.dcn': 'DC−',
  'drive.pe': 'PE',
  'drive.u': 'U',
  'drive.v': 'V',
  'drive.w': 'W',
  'motor.u1': 'U1',
  'motor.v1': 'V1',
  'motor.w1': 'W1',
}

export const PROVER_LABELS: Record<ProverPoint, string> = {
  'prover.pos': 'Prover +',
  'prover.neg': 'Prover −',
  'prover.ac': 'Prover ~',
}

export const DEVICE_KINDS = ['pushbutton', 'selector', 'potentiometer'] as const
export type DeviceKind = (typeof DEVICE_KINDS)[number]

export const DEVICE_TERMINALS: Record<DeviceKind, readonly string[]> = {
  pushbutton: ['a', 'b'],
  selector: ['a', 'b'],
  potentiometer: ['hi', 'wiper', 'lo'],
}

export function digitalInputPoint(n: number): DriveControlPoint {
  return `drive.di${n}` as DriveControlPoint
}

export function isDrivePowerPoint(point: PointId): point is DrivePowerPoint {
  return (DRIVE_POWER_POINTS as readonly string[]).includes(point)
}

export function isDriveControlPoint(point: PointId): point is DriveControlPoint {
  return (DRIVE_CONTROL_POINTS as readonly string[]).includes(point)
}

/** All control-network points for a set of devices, drive terminals first. */
export function controlPointsFor(devices: readonly { id: string; kind: DeviceKind }[]): PointId[] {
  const points: PointId[] = [...DRIVE_CONTROL_POINTS]
  for (const device of devices) {
    for (const terminal of DEVICE_TERMINALS[device.kind]) points.push(`${device.id}.${terminal}`)
  }
  return points
}

export function outputPoint(phase: OutputPhase): DrivePowerPoint {
  return `drive.${phase}`
}

export function motorPoint(terminal: MotorTerminal): MotorPoint {
  return `motor.${terminal}`
}
