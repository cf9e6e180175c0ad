// stoppedBy and restartedWithRememberedReference: read from the sequence of drive control states.
import type { DriveReading } from '../../model'
import { formatHz, formatTime, joinTexts } from '../format'
import { isRunning } from '../samples'
import type { Evaluator } from './types'

const DEFAULT_REFERENCE_TOLERANCE_HZ = 0.5

export const stoppedBy: Evaluator<'stoppedBy'> = (objective, { trace }) => {
  const { samples } = trace
  const stopping = objective.mode === 'ramp' ? 'rampStopping' : 'coasting'
  const minHz = objective.fromAtLeastHz ?? 0
  let lastMiss: { text: string; at: number } | undefined
  for (let i = 1; i < samples.length; i++) {
    const before = samples[i - 1].drive
    const now = samples[i].drive
    const began = isRunning(before) && (now.control === 'rampStopping' || now.control === 'coasting')
    if (!began) continue
    const t = samples[i].t
    const fromHz = before.outputHz
    if (now.control !== stopping || now.tripped) {
      const how = now.tripped
        ? `a trip (${joinTexts(now.faults.map((f) => f.text))})`
        : `a ${modeName(now)} stop`
      lastMiss = { text: `At ${formatTime(t)} the drive stopped by ${how} from ${formatHz(fromHz)}.`, at: t }
      continue
    }
    if (fromHz < minHz) {
      lastMiss = {
        text: `The ${objective.mode} stop at ${formatTime(t)} began at ${formatHz(fromHz)}, below ${formatHz(minHz)}.`,
        at: t,
      }
      continue
    }
    // A coast stop (IEC 60204-1 category 0) is complete once power is removed; a ramp stop
    // (category 1) only at standstill, and a trip on the way (bus overvoltage) spoils it.
    if (objective.mode === 'coast') {
      return {
        met: true,
        evidence: `At ${formatTime(t)} the drive removed power and let the motor coast from ${formatHz(fromHz)}.`,
        at: t,
      }
    }
    let j = i + 1
    while (j < samples.length && samples[j].drive.control === stopping && !samples[j].drive.tripped) j++
    const outcome = samples[j]?.drive
    if (outcome && outcome.control === 'stopped' && !outcome.tripped) {
      return {
        met: true,
        evidence: `At ${formatTime(t)} the drive began a ${objective.mode} stop from ${formatHz(fromHz)} and was at standstill by ${formatTime(samples[j].t)}.`,
        at: t,
      }
    }
    lastMiss = outcome
      ? {
          text: outcome.tripped
            ? `The ${objective.mode} stop from ${formatHz(fromHz)} at ${formatTime(t)} ended in a trip at ${formatTime(samples[j].t)}: ${joinTexts(outcome.faults.map((f) => f.text))}.`
            : `The ${objective.mode} stop from ${formatHz(fromHz)} at ${formatTime(t)} was interrupted at ${formatTime(samples[j].t)}.`,
          at: samples[j].t,
        }
      : {
          text: `The ${objective.mode} stop begun at ${formatTime(t)} had not finished when the attempt ended.`,
          at: t,
        }
  }
  if (lastMiss) return { met: false, evidence: lastMiss.text, at: lastMiss.at }
  return { met: false, evidence: `The drive was never stopped by ${objective.mode} while running.` }
}

function modeName(drive: DriveReading): string {
  return drive.control === 'coasting' ? 'coast' : 'ramp'
}

export const restartedWithRememberedReference: Evaluator<'restartedWithRememberedReference'> = (
  objective,
  { trace },
) => {
  const { samples } = trace
  const tolerance = objective.toleranceHz ?? DEFAULT_REFERENCE_TOLERANCE_HZ
  const minHz = objective.minReferenceHz ?? 0
  let lastRunning: { hz: number; t: number } | undefined
  let stoppedAt: { hz: number; t: number } | undefined
  let poweredDown = false
  let lastMiss: { text: string; at: number } | undefined
  for (let i = 0; i < samples.length; i++) {
    const { drive, t } = samples[i]
    const running = isRunning(drive)
    if (!running) {
      if (lastRunning && !stoppedAt) {
        stoppedAt = lastRunning
        poweredDown = false
      }
      if (stoppedAt && !drive.displayOn) poweredDown = true
      continue
    }
    if (stoppedAt) {
      // The first running sample after a stop: a restart.
      const restartHz = drive.referenceHz
      const remembered = stoppedAt
      stoppedAt = undefined
      const story = `Stopped at ${formatTime(remembered.t)} with the reference at ${formatHz(remembered.hz)}; restarted at ${formatTime(t)} with ${formatHz(restartHz)}`
      if (objective.acrossPowerLoss && !poweredDown) {
        lastMiss = { text: `${story}, but the drive was not powered down in between.`, at: t }
      } else if (remembered.hz < minHz) {
        lastMiss = { text: `${story}; the remembered reference must be at least ${formatHz(minHz)}.`, at: t }
      } else if (Math.abs(restartHz - remembered.hz) > tolerance) {
        lastMiss = { text: `${story}: the reference was not remembered.`, at: t }
      } else {
        const via = objective.acrossPowerLoss ? ' after a power-down' : ''
        return { met: true, evidence: `${story}${via}.`, at: t }
      }
    }
    lastRunning = { hz: drive.referenceHz, t }
  }
  if (lastMiss) return { met: false, evidence: lastMiss.text, at: lastMiss.at }
  return {
    met: false,
    evidence: objective.acrossPowerLoss
      ? 'The drive was never restarted after a stop and a power-down.'
      : 'The drive was never restarted after a stop.',
  }
}
