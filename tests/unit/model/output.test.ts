// The drive's output: voltage by V/Hz, current and torque following the load (fan or conveyor).
import { describe, expect, it } from 'vitest'
import {
  advance,
  createSimulation,
  loadTorqueFraction,
  motorAmps,
  readDrive,
  readFrontPanel,
  vPerHzVolts,
  type DriveReading,
  type LoadKind,
  type MotorNameplate,
  type SettingValues,
  type SimulationSetup,
} from '../../../shared/model/index'
import { DEFAULT_SETTINGS } from '../../../shared/model/settings'
import { run } from './fixtures'

/** A 5 hp, 460 V, 60 Hz motor (the sawmill infeed's plate). */
const motor460: MotorNameplate = {
  serial: 'TEST-460',
  ratedVolts: 460,
  ratedHz: 60,
  ratedPower: 5,
  powerUnit: 'hp',
  fullLoadAmps: 6.4,
  powerFactor: 0.82,
  efficiencyPercent: 89.5,
  connection: 'star',
  ratedRpm: 1750,
  duty: 'S1',
}

function keypadDrive(loadKind: LoadKind, loadFraction = 1, maxHz = 90): SimulationSetup {
  return {
    devices: [],
    wires: [],
    settings: {
      'motor.ratedVoltage': 460,
      'motor.ratedFrequency': 60,
      'motor.ratedSpeed': 1750,
      'motor.ratedCurrent': 6.4,
      'control.source': 'keypad',
      'speed.min': 0,
      'speed.max': maxHz,
      'ramp.accelSeconds': 5,
      'ramp.decelSeconds': 5,
    },
    power: { on: true, locked: false },
    faults: [],
    lineVolts: 460,
    motor: motor460,
    machine: { loadKind, loadFraction },
  }
}

/** Running steadily at a keypad setpoint. */
function runningAt(hz: number, loadKind: LoadKind = 'constantTorque', loadFraction = 1): DriveReading {
  const s = run(createSimulation(keypadDrive(loadKind, loadFraction)), [
    { t: 0, type: 'setting.changed', key: 'reference.keypadSetpoint', value: hz },
    { t: 0, type: 'settings.saved' },
    { t: 0, type: 'keypad.key', key: 'run' },
  ])
  const drive = readDrive(advance(s, 20_000))
  expect(drive.control).toBe('atSpeed')
  return drive
}

const settings460: SettingValues = {
  ...DEFAULT_SETTINGS,
  'motor.ratedVoltage': 460,
  'motor.ratedFrequency': 60,
}

describe('output voltage by V/Hz', () => {
  it('is 460 V at 60 Hz and about 230 V at 30 Hz: 7.67 V/Hz (MIL-HDBK-1003/3, appendix D)', () => {
    expect(runningAt(60).outputVolts).toBeCloseTo(460, 6)
    const half = runningAt(30).outputVolts
    expect(half).toBeCloseTo(230, 6)
    expect(half / 30).toBeCloseTo(7.67, 2)
  })

  it('stays at the rated voltage above base frequency (common practice: constant voltage, field weakening)', () => {
    expect(runningAt(75).outputVolts).toBeCloseTo(460, 6)
    expect(runningAt(90).outputVolts).toBeCloseTo(460, 6)
  })

  it('is proportional to frequency at every point below base (straight V/Hz line, no boost)', () => {
    for (const hz of [1, 12.5, 45, 59.9])
      expect(vPerHzVolts(hz, settings460, 460) / hz).toBeCloseTo(460 / 60, 9)
  })

  it('cannot exceed the line voltage the drive is fed from', () => {
    expect(vPerHzVolts(60, settings460, 400)).toBe(400)
  })

  it('is 0 V with the output off (stopped)', () => {
    expect(readDrive(createSimulation(keypadDrive('constantTorque'))).outputVolts).toBe(0)
  })

  it('is shown on the drive display, with the output current, only while the display is lit', () => {
    const s = run(createSimulation(keypadDrive('constantTorque')), [
      { t: 0, type: 'setting.changed', key: 'reference.keypadSetpoint', value: 30 },
      { t: 0, type: 'settings.saved' },
      { t: 0, type: 'keypad.key', key: 'run' },
    ])
    const panel = readFrontPanel(advance(s, 20_000))
    expect(panel.status!.outputVolts).toBeCloseTo(230, 6)
    expect(panel.status!.outputAmps).toBeGreaterThan(0)
  })
})

describe('load torque against speed (common practice; fan affinity law T ∝ n²)', () => {
  it('rises with the square of speed for a fan: half speed, a quarter of the torque', () => {
    expect(loadTorqueFraction('variableTorque', 0.8, 0.5)).toBeCloseTo(0.2, 12)
    expect(runningAt(30, 'variableTorque', 0.8).torquePercent).toBeCloseTo(20, 6)
    expect(runningAt(60, 'variableTorque', 0.8).torquePercent).toBeCloseTo(80, 6)
  })

  it('stays the same at every speed for a conveyor', () => {
    expect(runningAt(15, 'constantTorque', 0.7).torquePercent).toBeCloseTo(70, 6)
    expect(runningAt(45, 'constantTorque', 0.7).torquePercent).toBeCloseTo(70, 6)
  })
})

describe('output current follows the load', () => {
  it('is the full-load current at rated voltage, frequency and torque (the nameplate definition)', () => {
    expect(motorAmps(motor460, 1, 1)).toBeCloseTo(6.4, 9)
    expect(runningAt(60, 'constantTorque', 1).outputAmps).toBeCloseTo(6.4, 6)
  })

  it('falls to the magnetising current FLA·sin φ with no load (about half of FLA for a small motor, from memory)', () => {
    const sinPhi = Math.sqrt(1 - 0.82 ** 2)
    expect(motorAmps(motor460, 1, 0)).toBeCloseTo(6.4 * sinPhi, 9)
    expect(motorAmps(motor460, 1, 0) / 6.4).toBeGreaterThan(0.4)
    expect(motorAmps(motor460, 1, 0) / 6.4).toBeLessThan(0.7)
  })

  it('stays about constant across the speed range below base for a conveyor (constant torque, constant flux)', () => {
    const at15 = runningAt(15, 'constantTorque', 0.7).outputAmps
    const at45 = runningAt(45, 'constantTorque', 0.7).outputAmps
    expect(at45).toBeCloseTo(at15, 6)
  })

  it('rises with speed for a fan, from near the magnetising current towards full load', () => {
    const amps = [15, 30, 45, 60].map((hz) => runningAt(hz, 'variableTorque', 1).outputAmps)
    for (let i = 1; i < amps.length; i++) expect(amps[i]).toBeGreaterThan(amps[i - 1])
    expect(amps[3]).toBeCloseTo(6.4, 6)
  })

  it('rises above base frequency for a constant torque (weaker field needs more current per unit torque)', () => {
    expect(runningAt(75, 'constantTorque', 1).outputAmps).toBeGreaterThan(6.4)
  })

  it('is 0 A with the output off', () => {
    expect(readDrive(createSimulation(keypadDrive('variableTorque'))).outputAmps).toBe(0)
  })
})
