// Safe-practice objectives: no work on energised terminals, lock first, absence of voltage proved,
// isolated at the end. Thresholds: NEC 460.6 (capacitors to 50 V or less); IEC 60204-1 6.2.4 (60 V);
// verifying isolation before work: OSHA 29 CFR 1910.147(d); live-dead-live: NFPA 70E 120.5(7).
import { formatTime, formatVolts, lowerFirst, plural, upperFirst } from '../format'
import { describeWork, pairName } from '../names'
import { SAFE_VOLTS } from '../objectiveSchema'
import { DEFAULT_DEAD_PAIRS, DeadTestWatcher, type DeadWatch, type ProbePair } from '../proofs'
import { energised, isolationStart, lockInForce } from '../safety'
import { isTerminalWorkMoment, type Sample } from '../samples'
import { folding, type Evaluator, type Verdict } from './types'

interface WorkWatch {
  count: number
  highestBusVolts: number
  /** The first work that broke the rule: the verdict, whatever follows. */
  missed: Verdict | undefined
}

const NO_WORK: WorkWatch = { count: 0, highestBusVolts: -Infinity, missed: undefined }

/** Counts terminal work; `broken` says how a work breaks the rule, if it does. */
function workFolding(broken: (work: Sample) => string | null, met: (watch: WorkWatch) => string) {
  return folding<WorkWatch>(
    NO_WORK,
    (watch, sample) => {
      if (!isTerminalWorkMoment(sample)) return watch
      const why = watch.missed ? null : broken(sample)
      return {
        count: watch.count + 1,
        highestBusVolts: Math.max(watch.highestBusVolts, sample.drive.busVolts),
        missed: why
          ? {
              met: false,
              evidence: `${describeWork(sample)} at ${formatTime(sample.t)} ${why}.`,
              at: sample.t,
            }
          : watch.missed,
      }
    },
    (watch) => {
      if (watch.missed) return watch.missed
      if (watch.count === 0) return { met: true, evidence: 'No terminal work was done.' }
      return { met: true, evidence: met(watch) }
    },
  )
}

export const noWiringWhileEnergised: Evaluator<'noWiringWhileEnergised'> = (objective) => {
  const threshold = objective.thresholdVolts ?? SAFE_VOLTS
  return workFolding(
    (work) => {
      const live = energised(work, threshold)
      return live && `while ${live}`
    },
    (watch) =>
      `${upperFirst(plural(watch.count, 'terminal change'))}, all with the supply off and the DC bus below ${formatVolts(threshold)} (highest ${formatVolts(watch.highestBusVolts)}).`,
  )
}

export const lockBeforeWiring: Evaluator<'lockBeforeWiring'> = () =>
  workFolding(
    (work) => (lockInForce(work) === undefined ? 'with no lock on the disconnect' : null),
    (watch) =>
      `${watch.count === 1 ? 'The terminal change was' : `All ${watch.count} terminal changes were`} made with the disconnect locked off.`,
  )

interface ProofWatch {
  readings: DeadWatch
  /** Isolation starts whose proof was judged (at the first terminal work under each). */
  judgedStarts: readonly number[]
  /** Each judged isolation's proof, in words. */
  proofs: readonly string[]
  missed: Verdict | undefined
}

export const absenceOfVoltageProved: Evaluator<'absenceOfVoltageProved'> = (objective, { start }) => {
  const pairLabel = (pair: ProbePair) => pairName(pair, start.state)
  const threshold = objective.thresholdVolts ?? SAFE_VOLTS
  const watcher = new DeadTestWatcher(
    objective.pairs ?? DEFAULT_DEAD_PAIRS,
    Boolean(objective.proveMeterBefore || objective.proveMeterAfter),
  )

  /** The proof of dead for one isolation, from `lockT` to `until` (`what` says which work or the end). */
  const judge = (
    readings: DeadWatch,
    lockT: number,
    until: number,
    what: string,
  ): { proof: string } | Verdict => {
    const parts: string[] = []
    const tests = watcher.tests(watcher.since(readings, lockT), threshold)
    const failed = tests.find((d) => !d.proved)
    if (failed) {
      const seen = failed.lowest
        ? `its lowest reading was ${formatVolts(failed.lowest.volts)} at ${formatTime(failed.lowest.t)}`
        : 'it was never measured'
      return {
        met: false,
        evidence: `After ${formatTime(lockT)}, ${pairLabel(failed.pair)} was not proved below ${formatVolts(threshold)} ${what}: ${seen}.`,
        at: failed.lowest?.t ?? lockT,
      }
    }
    const firstDead = Math.min(...tests.map((d) => d.lowest?.t ?? until))
    const lastDead = Math.max(...tests.map((d) => d.lowest?.t ?? lockT))
    if (objective.proveMeterBefore) {
      const proved =
        readings.firstProof && readings.firstProof.t <= firstDead ? readings.firstProof : undefined
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
      // The readings' last dead reading is lastDead: the first proof from then on.
      const proved = watcher.since(readings, lockT).proofAfterDead
      if (!proved) {
        return {
          met: false,
          evidence: `The meter was not checked on a known live source after the dead test, ${what}.`,
          at: lastDead,
        }
      }
      parts.push(`meter re-proved on ${formatVolts(proved.volts)} at ${formatTime(proved.t)}`)
    }
    const values = tests.map((d) => `${pairLabel(d.pair)} ${formatVolts(d.lowest?.volts ?? 0)}`).join(', ')
    return { proof: [`after ${formatTime(lockT)}, ${what}: ${values}`, ...parts].join('; ') }
  }

  const initial: ProofWatch = {
    readings: watcher.empty,
    judgedStarts: [],
    proofs: [],
    missed: undefined,
  }
  return folding(
    initial,
    (watch, sample) => {
      if (watch.missed) return watch
      const readings = watcher.step(watch.readings, sample)
      // Each isolation that has terminal work in it needs its own proof before its first work.
      // (Whether a lock was applied is lockBeforeWiring's business: without one, the proof counts from
      // the moment the supply was last switched off.)
      const lockT = isTerminalWorkMoment(sample) ? isolationStart(sample) : undefined
      if (lockT === undefined || watch.judgedStarts.includes(lockT)) {
        return readings === watch.readings ? watch : { ...watch, readings }
      }
      const what = `before ${lowerFirst(describeWork(sample))} at ${formatTime(sample.t)}`
      const judged = judge(readings, lockT, sample.t, what)
      return {
        readings,
        judgedStarts: [...watch.judgedStarts, lockT],
        proofs: 'proof' in judged ? [...watch.proofs, judged.proof] : watch.proofs,
        missed: 'proof' in judged ? undefined : judged,
      }
    },
    (watch, end) => {
      if (watch.missed) return watch.missed
      let proofs = watch.proofs
      // With no terminal work at all, the proof must happen under the isolation in force at the end.
      if (watch.judgedStarts.length === 0) {
        const judged = judge(watch.readings, isolationStart(end), end.t, `by the end (${formatTime(end.t)})`)
        if (!('proof' in judged)) return judged
        proofs = [judged.proof]
      }
      return { met: true, evidence: `Absence of voltage proved ${proofs.join('; ')}.` }
    },
  )
}

export const isolated: Evaluator<'isolated'> = (objective) =>
  folding(
    null,
    (watch) => watch,
    (_watch, last) => {
      const { drive } = last
      const when = formatTime(last.t)
      if (drive.lineOn)
        return {
          met: false,
          evidence: `At the end (${when}) the supply disconnect was still on.`,
          at: last.t,
        }
      if (!drive.locked)
        return {
          met: false,
          evidence: `At the end (${when}) the disconnect was off but not locked.`,
          at: last.t,
        }
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
    },
  )
