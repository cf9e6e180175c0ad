// noFaultTrips, noAlarms, faultFoundAndCleared, finishedWithin.
import { faultPresent, type FaultCode, type Notice } from '../../model'
import { formatTime, joinTexts, upperFirst } from '../format'
import { faultName } from '../names'
import type { Sample } from '../samples'
import { fixed, folding, type Evaluator, type Verdict } from './types'

interface TripWatch {
  /** The faults of the sample before (a fault is fresh when that sample did not have it). */
  previous: readonly Notice<FaultCode>[] | undefined
  tripped: Verdict | undefined
}

export const noFaultTrips: Evaluator<'noFaultTrips'> = () =>
  folding<TripWatch>(
    { previous: undefined, tripped: undefined },
    (watch, sample) => {
      const { faults } = sample.drive
      if (watch.tripped || faults === watch.previous) return watch
      const previous = watch.previous ?? faults
      const fresh = faults.filter((f) => !previous.some((p) => p.code === f.code))
      if (fresh.length > 0) {
        return {
          previous: faults,
          tripped: {
            met: false,
            evidence: `Tripped at ${formatTime(sample.t)}: ${joinTexts(fresh.map((f) => f.text))}.`,
            at: sample.t,
          },
        }
      }
      return { previous: faults, tripped: undefined }
    },
    (watch) => watch.tripped ?? { met: true, evidence: 'The drive never tripped.' },
  )

interface AlarmWatch {
  /** The last moment the display was alive: a dark drive shows no alarm but has not cleared one. */
  lit: Sample | undefined
  lastAlarmed: Sample | undefined
}

export const noAlarms: Evaluator<'noAlarms'> = () =>
  folding<AlarmWatch>(
    { lit: undefined, lastAlarmed: undefined },
    (watch, sample) => {
      const { displayOn, alarms } = sample.drive
      if (!displayOn && alarms.length === 0) return watch
      // The same reading as the last lit sample (one moment): nothing a verdict reads changes.
      if (
        sample.drive === watch.lit?.drive &&
        (alarms.length === 0 || sample.drive === watch.lastAlarmed?.drive)
      ) {
        return watch
      }
      return {
        lit: displayOn ? sample : watch.lit,
        lastAlarmed: alarms.length > 0 ? sample : watch.lastAlarmed,
      }
    },
    ({ lit, lastAlarmed }) => {
      if (!lit) return { met: false, evidence: 'The drive was never powered, so its alarms were never seen.' }
      if (lit.drive.alarms.length > 0) {
        return {
          met: false,
          evidence: `At ${formatTime(lit.t)} the drive still showed: ${joinTexts(lit.drive.alarms.map((a) => a.text))}.`,
          at: lit.t,
        }
      }
      const cleared = lastAlarmed ? ` (last alarm seen at ${formatTime(lastAlarmed.t)})` : ''
      return { met: true, evidence: `No alarm shown at ${formatTime(lit.t)}${cleared}.`, at: lit.t }
    },
  )

export const faultFoundAndCleared: Evaluator<'faultFoundAndCleared'> = (objective, { scenario, start }) => {
  const fault = scenario.faults[objective.fault]
  if (!fault)
    return fixed({
      met: false,
      evidence: 'The objective names an injected fault the scenario does not have.',
    })
  const name = faultName(fault, start.state)
  // When the fault was last put right: the start of the run of samples without it that lasts to now.
  return folding<{ clearedAt: number | undefined }>(
    { clearedAt: undefined },
    (watch, sample) => {
      if (faultPresent(sample.state, fault))
        return watch.clearedAt === undefined ? watch : { clearedAt: undefined }
      return watch.clearedAt === undefined ? { clearedAt: sample.t } : watch
    },
    ({ clearedAt }, end) => {
      if (clearedAt === undefined) {
        return {
          met: false,
          evidence: `At the end (${formatTime(end.t)}) ${name} was still there.`,
          at: end.t,
        }
      }
      return {
        met: true,
        evidence: `${upperFirst(name)} was put right at ${formatTime(clearedAt)}.`,
        at: clearedAt,
      }
    },
  )
}

export const finishedWithin: Evaluator<'finishedWithin'> = (objective) => {
  const limit = objective.minutes * 60_000
  return folding(
    null,
    (watch) => watch,
    (_watch, end) => ({
      met: end.t <= limit,
      evidence: `Finished at ${formatTime(end.t)}; the limit was ${formatTime(limit)}.`,
      at: end.t,
    }),
  )
}
