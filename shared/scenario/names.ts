// Names of things as the panel shows them, for every text a person reads: evidence, safety
// messages, replay, mails and exports. No internal id, key or enum value leaves through here.
// How wires and terminals are marked (W4, 13–14, H/W/L) is defined once in shared/schematic/markings.ts.
// (Kinds of objectives and violations are named in kindLabels.ts, which needs no model.)
import {
  DIAGNOSIS_FINDING_SHORT,
  METER_MODE_LABELS,
  POINT_LABELS,
  PROVER_LABELS,
  inputFunctionKey,
  isSettingKey,
  settingDef,
  type DiagnosisFinding,
  type DiagnosisTarget,
  type InputFunction,
  type MeterReading,
  type OutputPhase,
  type SimState,
} from '../model'
import { formatNumber, formatVolts } from './format'
import { POTENTIOMETER_MARKINGS, contactWords, deviceTerminalLabels, wireNumber } from '../schematic/markings'
import type { ProbePair } from './proofs'
import type { Sample } from './samples'
import type { ScenarioFault } from './schema'

export { objectiveKindLabel, safetyViolationKindLabel } from './kindLabels'
// Wire numbers and terminal markings have one definition, shared with the schematic and the panel.
export { contactWords, deviceTerminalLabels, wireNumber } from '../schematic/markings'

/**
 * The wire's number in a state; a wire not fitted there is numbered where the panel puts a new one
 * (last). Undefined for a wire the panel could not have numbered (not fitted, no number in its id).
 */
export function wireName(wireId: string, state: SimState, adding = false): string | undefined {
  const index = state.wires.findIndex((w) => w.id === wireId)
  if (index >= 0) return wireNumber(wireId, index)
  if (adding || /\d$/.test(wireId)) return wireNumber(wireId, state.wires.length)
  return undefined
}

const POTENTIOMETER_ENDS: Record<string, string> = {
  hi: `high end (${POTENTIOMETER_MARKINGS.hi})`,
  wiper: `wiper (${POTENTIOMETER_MARKINGS.wiper})`,
  lo: `low end (${POTENTIOMETER_MARKINGS.lo})`,
}

/** A device's contact terminals as its label shows them, e.g. "13–14" ("" for a potentiometer). */
export function contactTerminals(deviceId: string, state: SimState): string {
  const device = state.devices[deviceId]
  if (!device || device.spec.kind === 'potentiometer') return ''
  const labels = deviceTerminalLabels(device.spec.kind, device.spec.contact)
  return `${labels.a}–${labels.b}`
}

/** A device's contact as its label shows it, e.g. "Fan run / stop, contact 13–14". */
export function contactName(deviceId: string, state: SimState): string {
  const terminals = contactTerminals(deviceId, state)
  return terminals ? `${deviceName(deviceId, state)}, contact ${terminals}` : deviceName(deviceId, state)
}

export function deviceName(deviceId: string, state: SimState): string {
  return state.devices[deviceId]?.spec.label ?? 'a device the panel does not have'
}

/** A terminal as the panel labels it: "DI1", "L1", "Fan run / stop terminal 13", "Stirrer speed wiper (W)". */
export function pointName(point: string | null, state: SimState): string {
  if (point === null) return 'nothing'
  const fixed =
    (POINT_LABELS as Record<string, string>)[point] ?? (PROVER_LABELS as Record<string, string>)[point]
  if (fixed) return fixed
  const dot = point.lastIndexOf('.')
  const device = state.devices[point.slice(0, dot)]
  const terminal = point.slice(dot + 1)
  if (!device) return 'a terminal the panel does not have'
  if (device.spec.kind === 'potentiometer') {
    const end = POTENTIOMETER_ENDS[terminal]
    return end ? `${device.spec.label} ${end}` : 'a terminal the panel does not have'
  }
  const number = deviceTerminalLabels(device.spec.kind, device.spec.contact)[terminal]
  return number ? `${device.spec.label} terminal ${number}` : 'a terminal the panel does not have'
}

export function pairName(pair: ProbePair, state: SimState): string {
  return `${pointName(pair[0], state)}–${pointName(pair[1], state)}`
}

/** A digital-input function as the settings list names it, e.g. "Raise speed". */
export function inputFunctionName(fn: InputFunction | string): string {
  const def = settingDef(inputFunctionKey(1))
  const option = def.kind === 'choice' ? def.options.find((o) => o.value === fn) : undefined
  return option?.label ?? 'a function the drive does not have'
}

/** A setting as the settings list names it, in quotes: "Stop method". */
export function settingName(key: string): string {
  return isSettingKey(key) ? `"${settingDef(key).label}"` : 'a setting the drive does not have'
}

/** A value of a setting with its unit or option label, e.g. "45 s", "Ramp to standstill, then output off". */
export function settingValueName(key: string, value: unknown): string {
  if (!isSettingKey(key)) return typeof value === 'string' ? 'a value the drive does not have' : String(value)
  const def = settingDef(key)
  if (typeof value === 'boolean') return value ? 'on' : 'off'
  if (def.kind === 'choice') {
    const option = def.options.find((o) => o.value === value)
    return option ? `"${option.label}"` : 'a value the drive does not offer'
  }
  if (def.kind === 'number') return `${value} ${def.unit}`.trim()
  return String(value)
}

/** A motor-cable conductor by the drive output it starts on: "U", "V", "W". */
export function conductorName(conductor: OutputPhase): string {
  return POINT_LABELS[`drive.${conductor}`]
}

/** The terminal work a sample is the moment before, in words (what the apprentice's hands did). */
export function describeWork(before: Sample): string {
  const { event, state } = before
  switch (event?.type) {
    case 'wire.added':
      return `Wire ${wireName(event.id, state, true)} added from ${pointName(event.from, state)} to ${pointName(event.to, state)}`
    case 'wire.removed': {
      const wire = wireName(event.id, state)
      return wire ? `Wire ${wire} removed` : 'A wire that was not fitted removed'
    }
    case 'device.contactFitted':
      return `A ${contactWords(event.contact)} contact block fitted to ${deviceName(event.device, state)}`
    case 'fuse.replaced':
      return 'Control fuse replaced'
    case 'motor.conductorLanded':
      return event.terminal
        ? `Motor-cable conductor ${conductorName(event.conductor)} landed on ${pointName(`motor.${event.terminal}`, state)}`
        : `Motor-cable conductor ${conductorName(event.conductor)} lifted`
    case 'motor.cableReplaced':
      return 'Motor cable replaced'
    default:
      return 'Terminal work'
  }
}

/** An injected fault, named as what an apprentice finds. */
export function faultName(fault: ScenarioFault, state: SimState): string {
  switch (fault.kind) {
    case 'brokenWire': {
      const wire = wireName(fault.wireId, state)
      return wire ? `the broken wire ${wire}` : 'the broken wire'
    }
    case 'blownFuse':
      return 'the blown control fuse'
    case 'motorConductorOpen':
      return `the broken ${conductorName(fault.conductor)} conductor of the motor cable`
    case 'contactFailedOpen':
      return `the failed-open contact ${contactTerminals(fault.device, state)} on ${deviceName(fault.device, state)}`
    case 'contactWelded':
      return `the welded contact ${contactTerminals(fault.device, state)} on ${deviceName(fault.device, state)}`
    case 'wrongContactType':
      return `the wrong contact block ${contactTerminals(fault.device, state)} on ${deviceName(fault.device, state)}`
    case 'inputUnresponsive':
      return `the drive's input ${pointName(`drive.di${fault.input}`, state)}, which stopped responding`
    case 'settingChanged': {
      const before = state.settingsBefore?.[fault.key]
      const was = before === undefined ? '' : ` (it was ${settingValueName(fault.key, before)})`
      return `the setting ${settingName(fault.key)} changed to ${settingValueName(fault.key, fault.value)}${was}`
    }
  }
}

/** The part a diagnosis names, as the panel names it: "wire W3", "Raise", "the control fuse". */
export function diagnosisTargetName(target: DiagnosisTarget, state: SimState): string {
  switch (target.kind) {
    case 'wire': {
      const wire = wireName(target.wire, state)
      return wire ? `wire ${wire}` : 'a wire no longer fitted'
    }
    case 'device':
      return deviceName(target.device, state)
    case 'controlFuse':
      return 'the control fuse'
    case 'motorCable':
      return 'the motor cable'
    case 'setting':
      return `the setting ${settingName(target.key)}`
    case 'terminal':
      return `terminal ${pointName(target.point, state)}`
  }
}

/** A whole diagnosis in words: "wire W3: open circuit". */
export function diagnosisName(target: DiagnosisTarget, finding: DiagnosisFinding, state: SimState): string {
  return `${diagnosisTargetName(target, state)}: ${DIAGNOSIS_FINDING_SHORT[finding]}`
}

/** What the meter's window showed, in words: "24.0 V on V DC", "over-range on Resistance (Ω)". */
export function meterReadingName(reading: MeterReading): string {
  const range = METER_MODE_LABELS[reading.mode]
  switch (reading.shows) {
    case 'volts':
      return `${formatVolts(reading.volts ?? 0)} on ${range}`
    case 'ohms':
      return `${formatNumber(reading.ohms ?? 0, (reading.ohms ?? 0) >= 100 ? 0 : 1)} Ω on ${range}${reading.tone ? ' (tone)' : ''}`
    case 'overRange':
      return `over-range on ${range}`
    case 'voltagePresent':
      return `a voltage-present warning on ${range}`
    case 'blank':
      return 'nothing (the meter was off)'
  }
}

/** The probe points of a reading: "+24 (red) and 0V (black)". */
export function probePointsName(reading: MeterReading, state: SimState): string {
  return `${pointName(reading.red, state)} (red) and ${pointName(reading.black, state)} (black)`
}
