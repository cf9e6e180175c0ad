// Public interface of the drive, control-circuit and motor model (contract: README.md beside this file).
export * from './points'
export * from './settings'
export * from './setup'
export * from './events'
export * from './meterModes'
export * from './diagnosis'
export type * from './types'
export { createSimulation, applyEvent, advance } from './simulation'
export { readCircuit, readDrive, sameDriveReading } from './readings'
export { readFrontPanel, CHARGE_LAMP_VOLTS } from './frontPanel'
export {
  readMeter,
  voltageBetween,
  resistanceBetween,
  voltageRangeFor,
  pointEnergised,
  RESISTANCE_RANGE_OHMS,
  CONTINUITY_RANGE_OHMS,
  CONTINUITY_TONE_OHMS,
  VOLTAGE_PRESENT_VOLTS,
} from './meter'
export { replay, sampleTimeline } from './replay'
export { driveMachine } from './driveMachine'
export { synchronousRpm, shaftRpm, frequencyForRpm, slipFraction } from './motor'
export {
  nameplatePoles,
  nameplateProblems,
  nameplateFromSettings,
  ratedWatts,
  wattsFromElectricalFigures,
  windingOhms,
  TRADE_VOLTAGES,
  WATTS_PER_HP,
} from './nameplate'
export { vPerHzVolts, loadTorqueFraction, motorAmps, outputFigures } from './output'
export { STRAIGHT_CABLE, phaseOpen, phaseOrderReversed, conductorOn } from './motorCable'
export { INPUT_OHMS_AT_24V } from './circuit/constants'
export { ModelInputError } from './errors'
export { faultPresent, withFaultCleared } from './faults'
export { settingChangeRefusal } from './injection'
