// functionalCheck: with the drive running, holding a button moves the reference the right way;
// optionally, once released, the reference stays put (a creeping reference fails here).
import { formatHz, formatSeconds, formatTime, upperFirst } from '../format'
import { deviceName } from '../names'
import { isRunning, sampleAt, type Sample } from '../samples'
import { folding, type Evaluator, type Verdict } from './types'

// Both limits are our own choices: well above rounding, well below one raise/lower step.
/** Smallest change that counts as the reference moving (Hz). */
const MOVED_HZ = 0.1
/** Largest drift that still counts as holding (Hz). */
const HELD_HZ = 0.05
const DEFAULT_HOLD_SECONDS = 2

interface Miss {
  text: string
  at: number
}

/** One press of the device while running, followed until its outcome is known. */
type Press =
  | { phase: 'held'; order: number; pressed: Sample }
  | { phase: 'released'; order: number; pressed: Sample; released: Sample; moveText: string }
  | {
      phase: 'holding'
      order: number
      moveText: string
      pressedT: number
      /** The moment before the release (or the end, when never released). */
      releasedT: number
      releasedAfter: Sample
      windowEnd: number
      /** The first sample in the hold window that ran away from the reference at release. */
      drifted: Sample | undefined
      /** The last sample at or before the window's end. */
      lastInWindow: Sample
    }

type Released = Extract<Press, { phase: 'released' }>
type Holding = Extract<Press, { phase: 'holding' }>

type Outcome = { order: number; met: true; verdict: Verdict } | { order: number; met: false; miss: Miss }

interface PressWatch {
  open: readonly Press[]
  /** The earliest press that succeeded, and the latest that missed, among those decided. */
  met: { order: number; verdict: Verdict } | undefined
  lastMiss: { order: number; miss: Miss } | undefined
}

export const functionalCheck: Evaluator<'functionalCheck'> = (objective, { start }) => {
  const label = deviceName(objective.device, start.state)
  const holdMs = (objective.holdSeconds ?? DEFAULT_HOLD_SECONDS) * 1000
  const drifts = (sample: Sample, baseHz: number) =>
    !isRunning(sample.drive) || Math.abs(sample.drive.referenceHz - baseHz) > HELD_HZ

  /** A press whose device was released at `released` (the moment before the release, or the end). */
  const release = (press: { order: number; pressed: Sample }, released: Sample): Outcome | Released => {
    const { order, pressed } = press
    const change = released.drive.referenceHz - pressed.drive.referenceHz
    const moved = objective.effect === 'raises' ? change >= MOVED_HZ : change <= -MOVED_HZ
    const span = `${formatTime(pressed.t)} to ${formatTime(released.t)}`
    if (!isRunning(released.drive)) {
      return {
        order,
        met: false,
        miss: { text: `The drive stopped while ${label} was held (${span}).`, at: released.t },
      }
    }
    const moveText = `holding ${label} from ${span} took the reference from ${formatHz(pressed.drive.referenceHz)} to ${formatHz(released.drive.referenceHz)}`
    if (!moved) {
      return {
        order,
        met: false,
        miss: {
          text: `With the drive running, ${moveText}: it did not ${objective.effect === 'raises' ? 'rise' : 'fall'}.`,
          at: pressed.t,
        },
      }
    }
    if (!objective.thenHolds) {
      return {
        order,
        met: true,
        verdict: { met: true, evidence: `With the drive running, ${moveText}.`, at: pressed.t },
      }
    }
    return { phase: 'released', order, pressed, released, moveText }
  }

  /** The hold window begins at the moment after the release. */
  const hold = (press: Released, releasedAfter: Sample): Holding => ({
    phase: 'holding',
    order: press.order,
    moveText: press.moveText,
    pressedT: press.pressed.t,
    releasedT: press.released.t,
    releasedAfter,
    windowEnd: releasedAfter.t + holdMs,
    drifted: undefined,
    lastInWindow: releasedAfter,
  })

  /** The outcome of a hold window that is over (the attempt went on past its end). */
  const judgeHold = (press: Holding): Outcome => {
    const { order, moveText, releasedAfter, windowEnd } = press
    const baseHz = releasedAfter.drive.referenceHz
    const atEnd = sampleAt(press.lastInWindow, windowEnd)
    const drifted = press.drifted ?? (drifts(atEnd, baseHz) ? atEnd : undefined)
    if (!drifted) {
      return {
        order,
        met: true,
        verdict: {
          met: true,
          evidence: `With the drive running, ${moveText}; after the release the reference stayed at ${formatHz(baseHz)} for ${formatSeconds(holdMs)}.`,
          at: press.pressedT,
        },
      }
    }
    return {
      order,
      met: false,
      miss: isRunning(drifted.drive)
        ? {
            text: `${upperFirst(moveText)}, but after the release the reference did not hold: ${formatHz(baseHz)} at ${formatTime(releasedAfter.t)}, ${formatHz(drifted.drive.referenceHz)} at ${formatTime(drifted.t)}.`,
            at: drifted.t,
          }
        : {
            text: `${upperFirst(moveText)}, but the drive stopped within ${formatSeconds(holdMs)} of the release.`,
            at: drifted.t,
          },
    }
  }

  /** The outcome of a press still open when the attempt ends at `end`. */
  const atEnd = (press: Press, end: Sample): Outcome => {
    if (press.phase === 'held') {
      const next = release(press, end)
      return 'met' in next ? next : atEnd(hold(next, end), end)
    }
    if (press.phase === 'released') return atEnd(hold(press, end), end)
    if (press.windowEnd > end.t) {
      return {
        order: press.order,
        met: false,
        miss: {
          text: `${upperFirst(press.moveText)}, but the attempt ended less than ${formatSeconds(holdMs)} after the release.`,
          at: press.releasedT,
        },
      }
    }
    return judgeHold(press)
  }

  const decide = (watch: PressWatch, outcome: Outcome): PressWatch => {
    if (outcome.met) {
      return !watch.met || outcome.order < watch.met.order
        ? { ...watch, met: { order: outcome.order, verdict: outcome.verdict } }
        : watch
    }
    return !watch.lastMiss || outcome.order > watch.lastMiss.order
      ? { ...watch, lastMiss: { order: outcome.order, miss: outcome.miss } }
      : watch
  }

  const initial: PressWatch = { open: [], met: undefined, lastMiss: undefined }
  return folding(
    initial,
    (watch, sample) => {
      const { event } = sample
      const isRelease =
        sample.at === 'before' && event?.type === 'device.released' && event.device === objective.device
      let next = watch
      let open: Press[] | undefined
      for (const press of watch.open) {
        let now: Press | Outcome = press
        if (press.phase === 'held' && isRelease) now = release(press, sample)
        else if (press.phase === 'released')
          now = hold(press, sample) // the moment after the release
        else if (press.phase === 'holding') {
          if (sample.t > press.windowEnd) now = judgeHold(press)
          else {
            const drifted =
              press.drifted ??
              (sample.t > press.releasedAfter.t && drifts(sample, press.releasedAfter.drive.referenceHz)
                ? sample
                : undefined)
            now = { ...press, drifted, lastInWindow: sample }
          }
        }
        if ('met' in now) next = decide(next, now)
        else (open ??= []).push(now)
      }
      if (open === undefined && watch.open.length > 0) next = { ...next, open: [] }
      else if (open) next = { ...next, open }
      if (sample.at === 'after' && event?.type === 'device.pressed' && event.device === objective.device) {
        if (!isRunning(sample.drive)) {
          next = decide(next, {
            order: sample.eventIndex,
            met: false,
            miss: {
              text: `${label} was pressed at ${formatTime(sample.t)} while the drive was not running.`,
              at: sample.t,
            },
          })
        } else {
          next = {
            ...next,
            open: [...next.open, { phase: 'held', order: sample.eventIndex, pressed: sample }],
          }
        }
      }
      return next
    },
    (watch, end) => {
      let decided = watch
      for (const press of watch.open) decided = decide(decided, atEnd(press, end))
      if (decided.met) return decided.met.verdict
      if (decided.lastMiss)
        return { met: false, evidence: decided.lastMiss.miss.text, at: decided.lastMiss.miss.at }
      return { met: false, evidence: `${label} was never pressed while the drive was running.` }
    },
  )
}
