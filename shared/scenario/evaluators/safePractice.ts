// Safe-practice objectives: no work on energised terminals, lock first, absence of voltage proved,
// isolated at the end. Thresholds: NEC 460.6 (capacitors to 50 V or less); IEC 60204-1 6.2.4 (60 V);
// verifying isolation before work: OSHA 29 CFR 1910.147(d); live-dead-live: NFPA 70E 120.5(7).
import { formatTime, formatVolts, lowerFirst, plural, upperFirst } from '../format'
import { SAFE_VOLTS } from '../objectiveSchema'
import {
  DEFAULT_DEAD_PAIRS,
  deadTests,
  describeWork,
  energised,
  isolationStart,
  lockInForce,
  meterProved,
  pairLabel,
  terminalWork,
} from '../safety'
import type { Evaluator } from './types'

export const noWiringWhileEnergised: Evaluator<'noWiringWhileEnergised'> = (objective, { trace }) => {
  const work = terminalWork(trace)
  if (work.length === 0) return { met: true, evidence: 'No terminal work was done.' }
  const threshold = objective.thresholdVolts ?? SAFE_VOLTS
  for (const w of work) {
    const live = energised(w.before, threshold)
    if (live)
      return {
        met: false,
        evidence: `${describeWork(w)} at ${formatTime(w.t)} while ${live}.`,
        at: w.t,
      }
  }
  const highest = Math.max(...work.map((w) => w.before.drive.busVolts))
  return {
    met: true,
    evidence: `${upperFirst(plural(work.length, 'terminal change'))}, all with the supply off and the DC bus below ${formatVolts(threshold)} (highest ${formatVolts(highest)}).`,
  }
}

export const lockBeforeWiring: Evaluator<'lockBeforeWiring'> = (_objective, { trace }) => {
  const work = terminalWork(trace)
  if (work.length === 0) return { met: true, evidence: 'No terminal work was done.' }
  for (const w of work) {
    if (lockInForce(trace, w.before) === undefined) {
      return {
        met: false,
        evidence: `${describeWork(w)} at ${formatTime(w.t)} with no lock on the disconnect.`,
        at: w.t,
      }
    }
  }
  return {
    met: true,
    evidence: `${work.length === 1 ? 'The terminal change was' : `All ${work.length} terminal changes were`} made with the disconnect locked off.`,
  }
}

export const absenceOfVoltageProved: Evaluator<'absenceOfVoltageProved'> = (objective, { trace }) => {
  const threshold = objective.thresholdVolts ?? SAFE_VOLTS
  const pairs = objective.pairs ?? DEFAULT_DEAD_PAIRS
  // Each lock period that has terminal work in it needs its own proof before its first work.
  // With no work at all, the proof must happen under the lock in force at the end.
  const windows: { lockT: number; until: number; what: string }[] = []
  const seenLocks = new Set<number>()
  const work = terminalWork(trace)
  for (const w of work) {
    // Whether a lock was applied is lockBeforeWiring's business; without one, the proof counts from
    // the moment the supply was last switched off.
    const lockT = isolationStart(trace, w.before)
    if (seenLocks.has(lockT)) continue
    seenLocks.add(lockT)
    windows.push({
      lockT,
      until: w.t,
      what: `before ${lowerFirst(describeWork(w))} at ${formatTime(w.t)}`,
    })
  }
  if (work.length === 0) {
    const lockT = isolationStart(trace, trace.samples[trace.samples.length - 1])
    windows.push({ lockT, until: trace.end, what: `by the end (${formatTime(trace.end)})` })
  }
  const proofs: string[] = []
  for (const window of windows) {
    const parts: string[] = []
    const tests = deadTests(trace, window.lockT, window.until, pairs, threshold)
    const failed = tests.find((d) => !d.proved)
    if (failed) {
      const seen = failed.lowest
        ? `its lowest reading was ${formatVolts(failed.lowest.volts)} at ${formatTime(failed.lowest.t)}`
        : 'it was never measured'
      return {
        met: false,
        evidence: `After ${formatTime(window.lockT)}, ${pairLabel(failed.pair)} was not proved below ${formatVolts(threshold)} ${window.what}: ${seen}.`,
        at: failed.lowest?.t ?? window.lockT,
      }
    }
    const firstDead = Math.min(...tests.map((d) => d.lowest?.t ?? window.until))
    const lastDead = Math.max(...tests.map((d) => d.lowest?.t ?? window.lockT))
    if (objective.proveMeterBefore) {
      const proved = meterProved(trace, 0, firstDead)
      if (!proved) {
        return {
          met: false,
          evidence: `The meter was not checked on a known live source before the dead test at ${formatTime(firstDead)}.`,
          at: firstDead,
        }
      }
      parts.push(`meter proved on ${formatVolts(proved.volts)} at ${formatTime(proved.t)}`)
    }
    if (objective.proveMeterAfter) {
      const proved = meterProved(trace, lastDead, window.until)
      if (!proved) {
        return {
          met: false,
          evidence: `The meter was not checked on a known live source after the dead test, ${window.what}.`,
          at: lastDead,
        }
      }
      parts.push(`meter re-proved on ${formatVolts(proved.volts)} at ${formatTime(proved.t)}`)
    }
    const readings = tests.map((d) => `${pairLabel(d.pair)} ${formatVolts(d.lowest?.volts ?? 0)}`).join(', ')
    proofs.push([`after ${formatTime(window.lockT)}, ${window.what}: ${readings}`, ...parts].join('; '))
  }
  const text = proofs.join('; ')
  return { met: true, evidence: `Absence of voltage proved ${text}.` }
}

export const isolated: Evaluator<'isolated'> = (objective, { trace }) => {
  const last = trace.samples[trace.samples.length - 1]
  const { drive } = last
  const when = formatTime(last.t)
  if (drive.lineOn)
    return { met: false, evidence: `At the end (${when}) the supply disconnect was still on.`, at: last.t }
  if (!drive.locked)
    return { met: false, evidence: `At the end (${when}) the disconnect was off but not locked.`, at: last.t }
  if (objective.thresholdVolts !== undefined && drive.busVolts > objective.thresholdVolts) {
    return {
      met: false,
      evidence: `At the end (${when}) the DC bus was still at ${formatVolts(drive.busVolts)}.`,
      at: last.t,
    }
  }
  return {
    met: true,
    evidence: `At the end (${when}) the supply was off and locked, DC bus ${formatVolts(drive.busVolts)}.`,
    at: last.t,
  }
}
