// Safe-practice facts shared by the safety objectives and the separate list of safety violations.
import { POINT_LABELS, type AttemptEvent } from '../model'
import { formatTime, formatVolts } from './format'
import { SAFE_VOLTS } from './objectiveSchema'
import { isTerminalWork, type AttemptTrace, type Sample } from './samples'

export interface SafetyViolation {
  kind: 'workWhileEnergised' | 'workWithoutLock' | 'workWithoutProvingDead'
  t: number
  /** Plain words: what happened and the values at the time. */
  text: string
}

export interface TerminalWork {
  t: number
  eventIndex: number
  event: AttemptEvent
  /** The state just before the work: what the apprentice's hands met. */
  before: Sample
}

/**
 * A meter reading of at least this many volts shows the meter works on a known live source. Our own
 * choice (not from a standard): above any residual reading, below the 24 V control supply, so either
 * the line or the control supply proves the meter. Common practice is a dedicated proving unit.
 */
export const PROVING_VOLTS = 20

export const DEFAULT_DEAD_PAIRS: readonly (readonly [string, string])[] = [
  ['drive.l1', 'drive.l2'],
  ['drive.l2', 'drive.l3'],
  ['drive.l1', 'drive.l3'],
  ['drive.dcp', 'drive.dcn'],
]

export function terminalWork(trace: AttemptTrace): TerminalWork[] {
  const work: TerminalWork[] = []
  for (const sample of trace.samples) {
    if (sample.at !== 'before') continue
    const event = trace.events[sample.eventIndex]
    if (isTerminalWork(event))
      work.push({ t: sample.t, eventIndex: sample.eventIndex, event, before: sample })
  }
  return work
}

export function describeWork(event: AttemptEvent): string {
  switch (event.type) {
    case 'wire.added':
      return `Wire ${event.id} added (${pointLabel(event.from)} to ${pointLabel(event.to)})`
    case 'wire.removed':
      return `Wire ${event.id} removed`
    case 'device.contactFitted':
      return `Contact block fitted to ${event.device}`
    case 'fuse.replaced':
      return 'Control fuse replaced'
    default:
      return `${event.type}`
  }
}

export function pointLabel(point: string): string {
  return (POINT_LABELS as Record<string, string>)[point] ?? point
}

/** Why the drive was energised at a moment, or null when it was safe to touch (supply off, bus low). */
export function energised(sample: Sample, thresholdVolts = SAFE_VOLTS): string | null {
  if (sample.drive.lineOn) return 'the supply disconnect was on'
  if (sample.drive.busVolts > thresholdVolts) return `the DC bus was at ${formatVolts(sample.drive.busVolts)}`
  return null
}

/** The lock.applied that a moment falls under (the latest one before it, still in force), if any. */
export function lockInForce(trace: AttemptTrace, sample: Sample): number | undefined {
  if (!sample.state.power.locked) return undefined
  for (let i = sample.applied - 1; i >= 0; i--) {
    if (trace.events[i].type === 'lock.applied') return trace.events[i].t
  }
  return 0 // locked from the start
}

/** Where a proof of dead must start: the lock in force, else the last switch-off (else the start). */
export function isolationStart(trace: AttemptTrace, sample: Sample): number {
  const lockT = lockInForce(trace, sample)
  if (lockT !== undefined) return lockT
  for (let i = sample.applied - 1; i >= 0; i--) {
    if (trace.events[i].type === 'power.off') return trace.events[i].t
  }
  return 0
}

export interface DeadTest {
  pair: readonly [string, string]
  /** Lowest |reading| seen on the pair inside the window, and when. */
  lowest?: { volts: number; t: number }
  proved: boolean
}

function onPair(sample: Sample, pair: readonly [string, string]): boolean {
  const { red, black } = sample.state.meter
  return (red === pair[0] && black === pair[1]) || (red === pair[1] && black === pair[0])
}

/** Meter readings on each pair within [from, to]: proved when one read below the threshold. */
export function deadTests(
  trace: AttemptTrace,
  from: number,
  to: number,
  pairs: readonly (readonly [string, string])[],
  thresholdVolts = SAFE_VOLTS,
): DeadTest[] {
  return pairs.map((pair) => {
    let lowest: DeadTest['lowest']
    for (const sample of trace.samples) {
      if (sample.t < from || sample.t > to || !onPair(sample, pair)) continue
      const volts = trace.circuit(sample).meter.volts
      if (volts === null) continue
      if (!lowest || Math.abs(volts) < lowest.volts) lowest = { volts: Math.abs(volts), t: sample.t }
    }
    return { pair, lowest, proved: lowest !== undefined && lowest.volts < thresholdVolts }
  })
}

/** First moment within [from, to] the meter read a known live source (|V| ≥ PROVING_VOLTS). */
export function meterProved(
  trace: AttemptTrace,
  from: number,
  to: number,
): { t: number; volts: number } | undefined {
  for (const sample of trace.samples) {
    if (sample.t < from || sample.t > to) continue
    const volts = trace.circuit(sample).meter.volts
    if (volts !== null && Math.abs(volts) >= PROVING_VOLTS) return { t: sample.t, volts: Math.abs(volts) }
  }
  return undefined
}

export function pairLabel(pair: readonly [string, string]): string {
  return `${pointLabel(pair[0])}–${pointLabel(pair[1])}`
}

/** Every unsafe moment of the attempt, whatever the scenario's objectives. */
export function safetyViolations(trace: AttemptTrace): SafetyViolation[] {
  const violations: SafetyViolation[] = []
  for (const work of terminalWork(trace)) {
    const what = describeWork(work.event)
    const when = formatTime(work.t)
    const live = energised(work.before)
    if (live)
      violations.push({ kind: 'workWhileEnergised', t: work.t, text: `${what} at ${when} while ${live}.` })
    if (lockInForce(trace, work.before) === undefined) {
      violations.push({
        kind: 'workWithoutLock',
        t: work.t,
        text: `${what} at ${when} with no lock on the disconnect.`,
      })
    }
    const from = isolationStart(trace, work.before)
    if (!deadTests(trace, from, work.t, DEFAULT_DEAD_PAIRS).every((d) => d.proved)) {
      violations.push({
        kind: 'workWithoutProvingDead',
        t: work.t,
        text: `${what} at ${when} before absence of voltage was proved on every line pair and the DC bus.`,
      })
    }
  }
  return violations
}
