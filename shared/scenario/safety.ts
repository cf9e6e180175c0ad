// Safe-practice facts shared by the safety objectives and the separate list of safety violations.
import { POINT_LABELS, PROVER_LABELS, voltageRangeFor, type AttemptEvent, type SimState } from '../model'
import { POTENTIOMETER_MARKINGS, contactMarkings, wireNumber } from '../schematic/markings'
import { formatTime, formatVolts } from './format'
import { SAFE_VOLTS } from './objectiveSchema'
import { firstSampleFrom, isTerminalWork, type AttemptTrace, type Sample } from './samples'

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

// One list per trace: the safety violations and three safe-practice objectives all ask for it.
const workByTrace = new WeakMap<AttemptTrace, TerminalWork[]>()

export function terminalWork(trace: AttemptTrace): readonly TerminalWork[] {
  let work = workByTrace.get(trace)
  if (!work) {
    work = []
    for (const [eventIndex, event] of trace.events.entries()) {
      if (!isTerminalWork(event)) continue
      const before = trace.before(eventIndex)
      work.push({ t: before.t, eventIndex, event, before })
    }
    workByTrace.set(trace, work)
  }
  return work
}

/** Terminal work in plain words: wires by the number on their marker, devices by their label. */
export function describeWork(work: Pick<TerminalWork, 'event' | 'before'>): string {
  const { event } = work
  const state = work.before.state
  switch (event.type) {
    case 'wire.added':
      return `Wire ${wireNumber(event.id, state.wires.length)} added (${pointLabel(event.from, state)} to ${pointLabel(event.to, state)})`
    case 'wire.removed':
      return `Wire ${wireNumber(
        event.id,
        Math.max(
          0,
          state.wires.findIndex((w) => w.id === event.id),
        ),
      )} removed`
    case 'device.contactFitted':
      return `Contact block fitted to ${state.devices[event.device]?.spec.label ?? 'a device'}`
    case 'fuse.replaced':
      return 'Control fuse replaced'
    case 'motor.conductorLanded':
      return event.terminal
        ? `Motor-cable conductor ${event.conductor.toUpperCase()} landed on ${pointLabel(`motor.${event.terminal}`)}`
        : `Motor-cable conductor ${event.conductor.toUpperCase()} lifted`
    case 'motor.cableReplaced':
      return 'Motor cable replaced'
    default:
      return `${event.type}`
  }
}

/** A terminal as printed: the drive's label, or a device's label and terminal marking. */
export function pointLabel(point: string, state?: Pick<SimState, 'devices'>): string {
  const drive =
    (POINT_LABELS as Record<string, string>)[point] ?? (PROVER_LABELS as Record<string, string>)[point]
  if (drive) return drive
  const [deviceId, terminal] = point.split('.')
  const device = state?.devices[deviceId]
  if (!device) return 'an unknown terminal'
  const spec = device.spec
  const marking =
    spec.kind === 'potentiometer'
      ? (POTENTIOMETER_MARKINGS as Record<string, string>)[terminal]
      : (contactMarkings(device.contact) as Record<string, string>)[terminal]
  return marking ? `${spec.label} ${marking}` : spec.label
}

/** Why the drive was energised at a moment, or null when it was safe to touch (supply off, bus low). */
export function energised(sample: Sample, thresholdVolts = SAFE_VOLTS): string | null {
  if (sample.drive.lineOn) return 'the supply disconnect was on'
  if (sample.drive.busVolts > thresholdVolts) return `the DC bus was at ${formatVolts(sample.drive.busVolts)}`
  return null
}

/** Times of the last lock.applied and the last power.off among the first n events, for each n. */
interface IsolationEvents {
  lastLockT: (number | undefined)[]
  lastOffT: (number | undefined)[]
}

// One pass per trace: every terminal work asks which lock (or switch-off) it falls under.
const isolationByTrace = new WeakMap<AttemptTrace, IsolationEvents>()

function isolationEvents(trace: AttemptTrace): IsolationEvents {
  let found = isolationByTrace.get(trace)
  if (!found) {
    const lastLockT: (number | undefined)[] = [undefined]
    const lastOffT: (number | undefined)[] = [undefined]
    for (const event of trace.events) {
      lastLockT.push(event.type === 'lock.applied' ? event.t : lastLockT[lastLockT.length - 1])
      lastOffT.push(event.type === 'power.off' ? event.t : lastOffT[lastOffT.length - 1])
    }
    found = { lastLockT, lastOffT }
    isolationByTrace.set(trace, found)
  }
  return found
}

/** The lock.applied that a moment falls under (the latest one before it, still in force), if any. */
export function lockInForce(trace: AttemptTrace, sample: Sample): number | undefined {
  if (!sample.state.power.locked) return undefined
  return isolationEvents(trace).lastLockT[sample.applied] ?? 0 // locked from the start
}

/** Where a proof of dead must start: the lock in force, else the last switch-off (else the start). */
export function isolationStart(trace: AttemptTrace, sample: Sample): number {
  return lockInForce(trace, sample) ?? isolationEvents(trace).lastOffT[sample.applied] ?? 0
}

export interface DeadTest {
  pair: readonly [string, string]
  /** Lowest |reading| seen on the pair inside the window, and when. */
  lowest?: { volts: number; t: number }
  proved: boolean
}

function onPair({ red, black }: SimState['meter'], pair: readonly [string, string]): boolean {
  return (red === pair[0] && black === pair[1]) || (red === pair[1] && black === pair[0])
}

// The samples with the meter on a pair, found once per trace and pair: the safety violations and the
// objectives ask about the same pairs for every terminal work.
const onPairByTrace = new WeakMap<AttemptTrace, Map<readonly [string, string], Sample[]>>()

function samplesOnPair(trace: AttemptTrace, pair: readonly [string, string]): readonly Sample[] {
  let byPair = onPairByTrace.get(trace)
  if (!byPair) onPairByTrace.set(trace, (byPair = new Map()))
  let samples = byPair.get(pair)
  if (!samples) {
    samples = []
    // Samples between two probe moves share one meter object: look at each placement once.
    let meter: SimState['meter'] | undefined
    let on = false
    for (const sample of trace.samples) {
      if (sample.state.meter !== meter) {
        meter = sample.state.meter
        on = onPair(meter, pair)
      }
      if (on) samples.push(sample)
    }
    byPair.set(pair, samples)
  }
  return samples
}

/**
 * Meter readings on each pair within [from, to]: proved when one read below the threshold on the voltage
 * range that shows what the pair could carry (V AC on a line pair, V DC on the bus): V DC across a live
 * line reads about 0 V, so a reading on the wrong range proves nothing.
 */
export function deadTests(
  trace: AttemptTrace,
  from: number,
  to: number,
  pairs: readonly (readonly [string, string])[],
  thresholdVolts = SAFE_VOLTS,
): DeadTest[] {
  return pairs.map((pair) => {
    let lowest: DeadTest['lowest']
    const measured = samplesOnPair(trace, pair)
    const range = voltageRangeFor(pair[0], pair[1])
    for (let i = firstSampleFrom(measured, from); i < measured.length && measured[i].t <= to; i++) {
      if (measured[i].state.meter.mode !== range) continue
      const volts = trace.circuit(measured[i]).meter.volts
      if (volts === null) continue
      if (!lowest || Math.abs(volts) < lowest.volts) lowest = { volts: Math.abs(volts), t: measured[i].t }
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
  const { samples } = trace
  for (let i = firstSampleFrom(samples, from); i < samples.length && samples[i].t <= to; i++) {
    const sample = samples[i]
    // A lifted probe reads nothing: no need to solve the circuit to know it.
    if (sample.state.meter.red === null || sample.state.meter.black === null) continue
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
    const what = describeWork(work)
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
