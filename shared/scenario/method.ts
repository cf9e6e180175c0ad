// Troubleshooting by method: what the right diagnosis of a fault is, and when a meter reading tells a
// fault apart. The grader's method objectives (evaluators/method.ts) and checkScenario read these.
import { TYPE1_LIMITS } from '../model/circuit/inputThresholds'
import {
  POINT_LABELS,
  readCircuit,
  readMeter,
  type DigitalInputNumber,
  withFaultCleared,
  type DiagnosisFinding,
  type DiagnosisTarget,
  type MeterReading,
  type SimState,
} from '../model'
import type { ScenarioFault } from './schema'

export interface DiagnosisAnswer {
  target: DiagnosisTarget
  /** Every finding that counts as right. */
  findings: readonly DiagnosisFinding[]
}

/**
 * The right diagnosis of an injected fault. A broken wire reads as an open conductor whether it broke
 * inside its insulation or came off its terminal, so both findings count for it.
 */
export function faultAnswer(fault: ScenarioFault): DiagnosisAnswer {
  switch (fault.kind) {
    case 'brokenWire':
      return { target: { kind: 'wire', wire: fault.wireId }, findings: ['open', 'notLanded'] }
    case 'blownFuse':
      return { target: { kind: 'controlFuse' }, findings: ['blown', 'open'] }
    case 'motorConductorOpen':
      return { target: { kind: 'motorCable' }, findings: ['open'] }
    case 'contactFailedOpen':
      return { target: { kind: 'device', device: fault.device }, findings: ['open'] }
    case 'contactWelded':
      return { target: { kind: 'device', device: fault.device }, findings: ['stuckClosed'] }
    case 'wrongContactType':
      return { target: { kind: 'device', device: fault.device }, findings: ['wrongContactType'] }
    case 'inputUnresponsive':
      return { target: { kind: 'terminal', point: `drive.di${fault.input}` }, findings: ['notResponding'] }
    case 'settingChanged':
      return { target: { kind: 'setting', key: fault.key }, findings: ['wrongSetting'] }
  }
}

/**
 * Two voltage readings differ materially when they are more than this apart (ours: well above a meter's
 * last-digit noise and the few tenths of a volt a closed contact or a healthy conductor drops, and well
 * below the 24 V control supply a broken conductor or a blown fuse takes away).
 */
export const MATERIAL_VOLTS = 2
/**
 * Two resistance readings differ materially when the larger is more than this many times the smaller and
 * more than MATERIAL_OHMS apart (ours: a closed contact, ~0 Ω, against an input, kilohms, or over-range).
 */
export const MATERIAL_OHMS_RATIO = 2
export const MATERIAL_OHMS = 1

/**
 * Whether the meter would show something a person could tell apart: a different kind of display (volts,
 * ohms, over-range, voltage present), the continuity tone on one and not the other, volts more than
 * MATERIAL_VOLTS apart, or ohms more than MATERIAL_OHMS_RATIO times and MATERIAL_OHMS apart.
 */
export function readingsDiffer(a: MeterReading, b: MeterReading): boolean {
  if (a.shows !== b.shows || a.tone !== b.tone) return true
  if (a.shows === 'volts') return Math.abs((a.volts ?? 0) - (b.volts ?? 0)) > MATERIAL_VOLTS
  if (a.shows === 'ohms') {
    const lo = Math.min(a.ohms ?? 0, b.ohms ?? 0)
    const hi = Math.max(a.ohms ?? 0, b.ohms ?? 0)
    return hi - lo > MATERIAL_OHMS && hi > MATERIAL_OHMS_RATIO * lo
  }
  return false
}

export interface TellingReading {
  reading: MeterReading
  /** What the same meter, probes and selector would show at this moment with the fault put right. */
  healthy: MeterReading
  /** Why the reading tells the fault apart when the healthy bench reads the same (a dead input). */
  because?: string
}

/**
 * The reading on the bench now, when it tells the fault apart: the same moment with only that fault
 * cleared (the model's withFaultCleared) reads materially differently. Undefined when the meter is off,
 * a probe is lifted, or the reading would be the same on a healthy bench.
 */
export function tellingReading(state: SimState, fault: ScenarioFault): TellingReading | undefined {
  const { red, black, mode } = state.meter
  if (mode === 'off' || red === null || black === null) return undefined
  if (fault.kind === 'inputUnresponsive') return deadInputReading(state, fault.input)
  const reading = readMeter(state)
  const healthy = readMeter(withFaultCleared(state, fault))
  return readingsDiffer(reading, healthy) ? { reading, healthy } : undefined
}

/**
 * A dead input reads the same on the meter as a healthy one: what tells it apart is the meter showing
 * the terminal switched ON (at least the IEC 61131-2 type 1 ON voltage, 15 V, across it or to a supply
 * rail) while the drive's input display shows it OFF. Undefined unless a probe is on that input and the
 * input really sees an ON signal at this moment.
 */
function deadInputReading(state: SimState, input: DigitalInputNumber): TellingReading | undefined {
  const point = `drive.di${input}`
  if (state.meter.red !== point && state.meter.black !== point) return undefined
  if (readCircuit(state).inputs[input - 1]?.region !== 'on') return undefined
  const reading = readMeter(state)
  if (reading.shows !== 'volts' || Math.abs(reading.volts ?? 0) < TYPE1_LIMITS.onMinVolts) return undefined
  return {
    reading,
    healthy: reading,
    because: `enough to switch the input ON, while the drive showed ${POINT_LABELS[point as 'drive.di1']} OFF`,
  }
}
