// What the drive's front panel shows — its display, its I/O status screen and its charge lamp — and
// nothing a person standing at a real drive could not see.
import { busVoltsAt } from './bus'
import { inputFunctions } from './functions'
import { DIGITAL_INPUT_NUMBERS } from './points'
import { readDrive } from './readings'
import type { DriveReading, FrontPanelReading, FrontPanelStatus, SimState } from './types'

/**
 * The charge lamp is lit while the DC bus is above 60 V: IEC 60204-1 6.2.4 treats parts above 60 V as
 * hazardous until they have discharged to 60 V or less. It is fed from the bus itself, so it stays lit
 * after the display has gone dark (and a dark lamp still proves nothing: test with a meter).
 */
export const CHARGE_LAMP_VOLTS = 60

function stateOf(drive: DriveReading): FrontPanelStatus['state'] {
  if (drive.tripped) return 'tripped'
  if (drive.power === 'charging') return 'startingUp'
  if (drive.power === 'discharging') return 'poweringDown'
  return drive.control
}

export function readFrontPanel(state: SimState, drive: DriveReading = readDrive(state)): FrontPanelReading {
  const chargeLamp = busVoltsAt(state.bus, state.t, state.lineVolts) > CHARGE_LAMP_VOLTS
  if (!drive.displayOn) return { lit: false, chargeLamp, status: null, io: null }
  const functions = inputFunctions(state.settings.active)
  return {
    lit: true,
    chargeLamp,
    status: {
      state: stateOf(drive),
      commandSource: drive.controlSource,
      direction: drive.direction,
      outputOn: drive.outputOn,
      outputHz: drive.outputHz,
      referenceHz: drive.referenceHz,
      outputVolts: drive.outputVolts,
      outputAmps: drive.outputAmps,
      torquePercent: drive.torquePercent,
      busVolts: drive.busVolts,
      speedRpm: drive.speedRpm,
      faults: drive.faults,
      alarms: drive.alarms,
      restartInterlock: drive.restartInterlock,
    },
    io: {
      inputs: DIGITAL_INPUT_NUMBERS.map((input, i) => ({
        input,
        function: functions[i],
        on: drive.inputs[i],
      })),
      relayClosed: drive.relayClosed,
      analogVolts: Math.round(state.circuit.analogVolts * 100) / 100,
    },
  }
}
