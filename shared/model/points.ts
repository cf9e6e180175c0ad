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

/** Power terminals: reachable by the meter only (never wired in the simulator). */
export const DRIVE_POWER_POINTS = [
  'drive.l1',
  'drive.l2',
  'drive.l3',
  'drive.dcp',
  'drive.dcn',
  'drive.pe',
] as const
export type DrivePowerPoint = (typeof DRIVE_POWER_POINTS)[number]

/**
 * A meter proving unit on the bench: a known live source to check the meter on before and after a dead
 * test (live–dead–live, NFPA 70E 120.5(7)). It is battery-powered, so it is live whatever the disconnect does.
 */
export const PROVER_POINTS = ['prover.pos', 'prover.neg'] as const
export type ProverPoint = (typeof PROVER_POINTS)[number]
/** The proving unit's test voltage, DC (our figure; proving units commonly offer 50–690 V, from memory). */
export const PROVER_VOLTS = 110

export function isProverPoint(point: PointId): point is ProverPoint {
  return point === 'prover.pos' || point === 'prover.neg'
}

export type PointId = string

export const POINT_LABELS: Record<DriveControlPoint | DrivePowerPoint, string> = {
  'drive.p24': '+24',
  'drive.0v': '0V',
  'drive.dcom': 'DCM',
  'drive.di1': 'DI1',
  'drive.di2': 'DI2',
  'drive.di3': 'DI3',
  'drive.di4': 'DI4',
  'drive.di5': 'DI5',
  'drive.di6': 'DI6',
  'drive.p10': '+10',
  'drive.ai': 'AI',
  'drive.acom': 'AC',
  'drive.k1a': 'K1A',
  'drive.k1b': 'K1B',
  'drive.l1': 'L1',
  'drive.l2': 'L2',
  'drive.l3': 'L3',
  'drive.dcp': 'DC+',
  'drive.dcn': 'DC−',
  'drive.pe': 'PE',
}

export const PROVER_LABELS: Record<ProverPoint, string> = {
  'prover.pos': 'Prover +',
  'prover.neg': 'Prover −',
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
