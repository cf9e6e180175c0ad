// stoppedBy and restartedWithRememberedReference: read from the sequence of drive control states.
import type { DriveReading } from '../../model'
import { formatHz, formatTime, joinTexts } from '../format'
import { isRunning } from '../samples'
import { folding, type Evaluator, type Verdict } from './types'

const DEFAULT_REFERENCE_TOLERANCE_HZ = 0.5

interface Miss {
  text: string
  at: number
}

interface StopWatch {
  /** The first stop of the wanted kind: the verdict, whatever follows. */
  met: Verdict | undefined
  lastMiss: Miss | undefined
  /** A ramp stop begun and not yet over. */
  stopping: { t: number; fromHz: number } | undefined
}

export const stoppedBy: Evaluator<'stoppedBy'> = (objective) => {
  const stopping = objective.mode === 'ramp' ? 'rampStopping' : 'coasting'
  const minHz = objective.fromAtLeastHz ?? 0
  const modeName = (drive: DriveReading) => (drive.control === 'coasting' ? 'coast' : 'ramp')

  /** How a ramp stop begun at `begun` ended, at the first sample no longer stopping (or the end). */
  const outcome = (
    begun: { t: number; fromHz: number },
    at: { t: number; drive: DriveReading } | undefined,
  ) => {
    const { t, fromHz } = begun
    if (at && at.drive.control === 'stopped' && !at.drive.tripped) {
      const verdict: Verdict = {
        met: true,
        evidence: `At ${formatTime(t)} the drive began a ${objective.mode} stop from ${formatHz(fromHz)} and was at standstill by ${formatTime(at.t)}.`,
        at: t,
      }
      return verdict
    }
    const miss: Miss = at
      ? {
          text: at.drive.tripped
            ? `The ${objective.mode} stop from ${formatHz(fromHz)} at ${formatTime(t)} ended in a trip at ${formatTime(at.t)}: ${joinTexts(at.drive.faults.map((f) => f.text))}.`
            : `The ${objective.mode} stop from ${formatHz(fromHz)} at ${formatTime(t)} was interrupted at ${formatTime(at.t)}.`,
          at: at.t,
        }
      : {
          text: `The ${objective.mode} stop begun at ${formatTime(t)} had not finished when the attempt ended.`,
          at: t,
        }
    return miss
  }

  const initial: StopWatch = { met: undefined, lastMiss: undefined, stopping: undefined }
  return folding(
    initial,
    (watch, sample, previous) => {
      // The same reading as the sample before (one moment) changes nothing.
      if (watch.met || sample.drive === previous?.drive) return watch
      const now = sample.drive
      let { lastMiss, stopping: pending } = watch
      if (pending && (now.control !== stopping || now.tripped)) {
        const ended = outcome(pending, sample)
        if ('met' in ended) return { ...watch, met: ended }
        lastMiss = ended
        pending = undefined
      }
      const before = previous?.drive
      const began =
        before && isRunning(before) && (now.control === 'rampStopping' || now.control === 'coasting')
      if (began) {
        const t = sample.t
        const fromHz = before.outputHz
        if (now.control !== stopping || now.tripped) {
          const how = now.tripped
            ? `a trip (${joinTexts(now.faults.map((f) => f.text))})`
            : `a ${modeName(now)} stop`
          lastMiss = {
            text: `At ${formatTime(t)} the drive stopped by ${how} from ${formatHz(fromHz)}.`,
            at: t,
          }
        } else if (fromHz < minHz) {
          lastMiss = {
            text: `The ${objective.mode} stop at ${formatTime(t)} began at ${formatHz(fromHz)}, below ${formatHz(minHz)}.`,
            at: t,
          }
        } else if (objective.mode === 'coast') {
          // A coast stop (IEC 60204-1 category 0) is complete once power is removed; a ramp stop
          // (category 1) only at standstill, and a trip on the way (bus overvoltage) spoils it.
          const met: Verdict = {
            met: true,
            evidence: `At ${formatTime(t)} the drive removed power and let the motor coast from ${formatHz(fromHz)}.`,
            at: t,
          }
          return { ...watch, met }
        } else {
          pending = { t, fromHz }
        }
      }
      return lastMiss === watch.lastMiss && pending === watch.stopping
        ? watch
        : { met: undefined, lastMiss, stopping: pending }
    },
    (watch) => {
      if (watch.met) return watch.met
      const lastMiss = watch.stopping ? (outcome(watch.stopping, undefined) as Miss) : watch.lastMiss
      if (lastMiss) return { met: false, evidence: lastMiss.text, at: lastMiss.at }
      return { met: false, evidence: `The drive was never stopped by ${objective.mode} while running.` }
    },
  )
}

interface RestartWatch {
  /** The last running moment before the drive stopped (cleared by a restart). */
  stoppedAt: { hz: number; t: number } | undefined
  poweredDown: boolean
  lastMiss: Miss | undefined
  met: Verdict | undefined
}

export const restartedWithRememberedReference: Evaluator<'restartedWithRememberedReference'> = (
  objective,
) => {
  const tolerance = objective.toleranceHz ?? DEFAULT_REFERENCE_TOLERANCE_HZ
  const minHz = objective.minReferenceHz ?? 0
  const initial: RestartWatch = {
    stoppedAt: undefined,
    poweredDown: false,
    lastMiss: undefined,
    met: undefined,
  }
  return folding(
    initial,
    (watch, { drive, t }, previous) => {
      // The same reading as the sample before (one moment) changes nothing.
      if (watch.met || drive === previous?.drive) return watch
      if (!isRunning(drive)) {
        let { stoppedAt, poweredDown } = watch
        // The first moment not running after running: the stop, with the reference it had.
        if (!stoppedAt && previous && isRunning(previous.drive)) {
          stoppedAt = { hz: previous.drive.referenceHz, t: previous.t }
          poweredDown = false
        }
        if (stoppedAt && !drive.displayOn) poweredDown = true
        return stoppedAt === watch.stoppedAt && poweredDown === watch.poweredDown
          ? watch
          : { ...watch, stoppedAt, poweredDown }
      }
      const remembered = watch.stoppedAt
      if (!remembered) return watch
      // The first running sample after a stop: a restart.
      const restartHz = drive.referenceHz
      const story = `Stopped at ${formatTime(remembered.t)} with the reference at ${formatHz(remembered.hz)}; restarted at ${formatTime(t)} with ${formatHz(restartHz)}`
      let lastMiss: Miss
      if (objective.acrossPowerLoss && !watch.poweredDown) {
        lastMiss = { text: `${story}, but the drive was not powered down in between.`, at: t }
      } else if (remembered.hz < minHz) {
        lastMiss = { text: `${story}; the remembered reference must be at least ${formatHz(minHz)}.`, at: t }
      } else if (Math.abs(restartHz - remembered.hz) > tolerance) {
        lastMiss = { text: `${story}: the reference was not remembered.`, at: t }
      } else {
        const via = objective.acrossPowerLoss ? ' after a power-down' : ''
        return { ...watch, met: { met: true, evidence: `${story}${via}.`, at: t } }
      }
      return { ...watch, stoppedAt: undefined, lastMiss }
    },
    (watch) => {
      if (watch.met) return watch.met
      if (watch.lastMiss) return { met: false, evidence: watch.lastMiss.text, at: watch.lastMiss.at }
      return {
        met: false,
        evidence: objective.acrossPowerLoss
          ? 'The drive was never restarted after a stop and a power-down.'
          : 'The drive was never restarted after a stop.',
      }
    },
  )
}
