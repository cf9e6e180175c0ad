// noFaultTrips, noAlarms, faultFoundAndCleared, finishedWithin.
import { faultPresent, type FaultCode, type Notice, type SimState } from '../../model'
import { formatTime, joinTexts, upperFirst } from '../format'
import { wireNumber } from '../../schematic/markings'
import type { ScenarioFault } from '../schema'
import type { Evaluator } from './types'

export const noFaultTrips: Evaluator<'noFaultTrips'> = (_objective, { trace }) => {
  const { samples } = trace
  // A fault is fresh when the sample before did not have it (the lists hold one or two faults).
  let previous: readonly Notice<FaultCode>[] = samples[0].drive.faults
  for (const sample of samples) {
    const { faults } = sample.drive
    const fresh = faults.filter((f) => !previous.some((p) => p.code === f.code))
    if (fresh.length > 0) {
      return {
        met: false,
        evidence: `Tripped at ${formatTime(sample.t)}: ${joinTexts(fresh.map((f) => f.text))}.`,
        at: sample.t,
      }
    }
    previous = faults
  }
  return { met: true, evidence: 'The drive never tripped.' }
}

export const noAlarms: Evaluator<'noAlarms'> = (_objective, { trace }) => {
  // The last moment the display was alive: a dark drive shows no alarm but has not cleared one.
  const lit = trace.samples.findLast((s) => s.drive.displayOn)
  if (!lit) return { met: false, evidence: 'The drive was never powered, so its alarms were never seen.' }
  if (lit.drive.alarms.length > 0) {
    return {
      met: false,
      evidence: `At ${formatTime(lit.t)} the drive still showed: ${joinTexts(lit.drive.alarms.map((a) => a.text))}.`,
      at: lit.t,
    }
  }
  const lastAlarmed = trace.samples.findLast((s) => s.drive.alarms.length > 0)
  const cleared = lastAlarmed ? ` (last alarm seen at ${formatTime(lastAlarmed.t)})` : ''
  return { met: true, evidence: `No alarm shown at ${formatTime(lit.t)}${cleared}.`, at: lit.t }
}

function faultName(fault: ScenarioFault, state: SimState): string {
  switch (fault.kind) {
    case 'brokenWire': {
      const index = state.wires.findIndex((w) => w.id === fault.wireId)
      return index < 0 ? 'the broken wire' : `the broken wire ${wireNumber(fault.wireId, index)}`
    }
    case 'blownFuse':
      return 'the blown control fuse'
    case 'motorConductorOpen':
      return `the broken ${fault.conductor.toUpperCase()} conductor of the motor cable`
    case 'contactFailedOpen':
      return `the failed-open contact on ${state.devices[fault.device]?.spec.label ?? fault.device}`
    case 'contactWelded':
      return `the welded contact on ${state.devices[fault.device]?.spec.label ?? fault.device}`
    case 'wrongContactType':
      return `the wrong contact block on ${state.devices[fault.device]?.spec.label ?? fault.device}`
  }
}

export const faultFoundAndCleared: Evaluator<'faultFoundAndCleared'> = (objective, { scenario, trace }) => {
  const fault = scenario.faults[objective.fault]
  const { samples } = trace
  if (!fault) return { met: false, evidence: `The scenario has no injected fault number ${objective.fault}.` }
  const name = faultName(fault, samples[0].state)
  const last = samples[samples.length - 1]
  if (faultPresent(last.state, fault)) {
    return { met: false, evidence: `At the end (${formatTime(last.t)}) ${name} was still there.`, at: last.t }
  }
  let clearedAt = last.t
  for (let i = samples.length - 1; i >= 0 && !faultPresent(samples[i].state, fault); i--)
    clearedAt = samples[i].t
  return {
    met: true,
    evidence: `${upperFirst(name)} was put right at ${formatTime(clearedAt)}.`,
    at: clearedAt,
  }
}

export const finishedWithin: Evaluator<'finishedWithin'> = (objective, { trace }) => {
  const limit = objective.minutes * 60_000
  const met = trace.end <= limit
  return {
    met,
    evidence: `Finished at ${formatTime(trace.end)}; the limit was ${formatTime(limit)}.`,
    at: trace.end,
  }
}
