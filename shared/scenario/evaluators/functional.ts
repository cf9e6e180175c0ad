// functionalCheck: with the drive running, holding a button moves the reference the right way;
// optionally, once released, the reference stays put (a creeping reference fails here).
import type { AttemptEvent } from '../../model'
import { formatHz, formatSeconds, formatTime, upperFirst } from '../format'
import { firstSampleFrom, isRunning, type Sample } from '../samples'
import type { Evaluator } from './types'

// Both limits are our own choices: well above rounding, well below one raise/lower step.
/** Smallest change that counts as the reference moving (Hz). */
const MOVED_HZ = 0.1
/** Largest drift that still counts as holding (Hz). */
const HELD_HZ = 0.05
const DEFAULT_HOLD_SECONDS = 2

export const functionalCheck: Evaluator<'functionalCheck'> = (objective, { trace }) => {
  const { samples, events } = trace
  const label = samples[0].state.devices[objective.device]?.spec.label ?? objective.device
  const holdMs = (objective.holdSeconds ?? DEFAULT_HOLD_SECONDS) * 1000
  let lastMiss: { text: string; at: number } | undefined

  for (let i = 0; i < samples.length; i++) {
    const pressed = samples[i]
    const event = pressed.eventIndex >= 0 ? events[pressed.eventIndex] : undefined
    if (pressed.at !== 'after' || event?.type !== 'device.pressed' || event.device !== objective.device)
      continue
    if (!isRunning(pressed.drive)) {
      lastMiss = {
        text: `${label} was pressed at ${formatTime(pressed.t)} while the drive was not running.`,
        at: pressed.t,
      }
      continue
    }
    const releaseIndex = nextRelease(samples, events, i, objective.device)
    const released: Sample = releaseIndex >= 0 ? samples[releaseIndex] : trace.stateAt(trace.end)
    const change = released.drive.referenceHz - pressed.drive.referenceHz
    const moved = objective.effect === 'raises' ? change >= MOVED_HZ : change <= -MOVED_HZ
    const span = `${formatTime(pressed.t)} to ${formatTime(released.t)}`
    if (!isRunning(released.drive)) {
      lastMiss = { text: `The drive stopped while ${label} was held (${span}).`, at: released.t }
      continue
    }
    const moveText = `holding ${label} from ${span} took the reference from ${formatHz(pressed.drive.referenceHz)} to ${formatHz(released.drive.referenceHz)}`
    if (!moved) {
      lastMiss = {
        text: `With the drive running, ${moveText}: it did not ${objective.effect === 'raises' ? 'rise' : 'fall'}.`,
        at: pressed.t,
      }
      continue
    }
    if (!objective.thenHolds)
      return { met: true, evidence: `With the drive running, ${moveText}.`, at: pressed.t }

    // After the release: every sample within the hold window, and the exact state at its end.
    const releasedAfter = releaseIndex >= 0 ? samples[releaseIndex + 1] : released
    const windowEnd = releasedAfter.t + holdMs
    if (windowEnd > trace.end) {
      lastMiss = {
        text: `${upperFirst(moveText)}, but the attempt ended less than ${formatSeconds(holdMs)} after the release.`,
        at: released.t,
      }
      continue
    }
    const window = samples.slice(
      firstSampleFrom(samples, releasedAfter.t, true),
      firstSampleFrom(samples, windowEnd, true),
    )
    window.push(trace.stateAt(windowEnd))
    const baseHz = releasedAfter.drive.referenceHz
    const drifted = window.find(
      (s) => !isRunning(s.drive) || Math.abs(s.drive.referenceHz - baseHz) > HELD_HZ,
    )
    if (!drifted) {
      return {
        met: true,
        evidence: `With the drive running, ${moveText}; after the release the reference stayed at ${formatHz(baseHz)} for ${formatSeconds(holdMs)}.`,
        at: pressed.t,
      }
    }
    lastMiss = isRunning(drifted.drive)
      ? {
          text: `${upperFirst(moveText)}, but after the release the reference did not hold: ${formatHz(baseHz)} at ${formatTime(releasedAfter.t)}, ${formatHz(drifted.drive.referenceHz)} at ${formatTime(drifted.t)}.`,
          at: drifted.t,
        }
      : {
          text: `${upperFirst(moveText)}, but the drive stopped within ${formatSeconds(holdMs)} of the release.`,
          at: drifted.t,
        }
  }
  if (!lastMiss) return { met: false, evidence: `${label} was never pressed while the drive was running.` }
  return { met: false, evidence: lastMiss.text, at: lastMiss.at }
}

/** Index of the first sample after `from` just before the device is released, or -1. */
function nextRelease(
  samples: readonly Sample[],
  events: readonly AttemptEvent[],
  from: number,
  device: string,
): number {
  for (let j = from + 1; j < samples.length; j++) {
    if (samples[j].at === 'before' && isReleaseOf(events[samples[j].eventIndex], device)) return j
  }
  return -1
}

function isReleaseOf(event: { type: string; device?: string } | undefined, device: string): boolean {
  return event?.type === 'device.released' && event.device === device
}
