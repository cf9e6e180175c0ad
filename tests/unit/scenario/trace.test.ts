// The attempt trace the evaluators read: drive readings made on first use (and shared between the
// samples of one moment), time windows found by binary search, terminal work and dead tests found
// once per trace, the lock each moment falls under. Each must give exactly what the plain definition gives: a scan of every sample.
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { readDrive, voltageRangeFor, type AttemptEvent, type PointId } from '@shared/model'
import { toSimulationSetup } from '@shared/scenario'
import {
  DEFAULT_DEAD_PAIRS,
  deadTests,
  isolationStart,
  lockInForce,
  meterProved,
  PROVING_VOLTS,
  terminalWork,
} from '@shared/scenario/safety'
import {
  firstSampleFrom,
  isTerminalWork,
  traceAttempt,
  type AttemptTrace,
  type Sample,
} from '@shared/scenario/samples'
import type { AttemptFixture } from './builders/buildFixtures'
import { shippedScenario } from './helpers'

const attemptsDir = resolve(import.meta.dirname, '../../fixtures/attempts')
const fixtures: AttemptFixture[] = readdirSync(attemptsDir)
  .filter((f) => f.endsWith('.json'))
  .sort()
  .map((f) => JSON.parse(readFileSync(resolve(attemptsDir, f), 'utf8')) as AttemptFixture)

const PROBE_POINTS: (PointId | null)[] = ['drive.p24', 'drive.0v', 'drive.l1', 'drive.l2', 'drive.dcp', null]

/** The log with meter probe moves between its events, as a long attempt has them. */
function withProbeMoves(events: AttemptEvent[], perGap: number): AttemptEvent[] {
  const out: AttemptEvent[] = []
  events.forEach((event, i) => {
    out.push(event)
    const next = events[i + 1]
    if (!next || next.type === 'attempt.ended') return
    for (let k = 1; k <= perGap; k++) {
      const t = event.t + Math.floor(((next.t - event.t) * k) / (perGap + 1))
      const red = PROBE_POINTS[(i + k) % PROBE_POINTS.length]
      const black = PROBE_POINTS[(i + 2 * k + 1) % PROBE_POINTS.length]
      out.push({ t, type: 'meter.probes', red, black })
    }
  })
  return out
}

const traces: [string, AttemptTrace][] = fixtures.flatMap((fixture) => {
  const setup = toSimulationSetup(shippedScenario(fixture.scenario))
  const name = `${fixture.scenario}--${fixture.name}`
  return [
    [name, traceAttempt(setup, fixture.events)],
    [`${name} with probe moves`, traceAttempt(setup, withProbeMoves(fixture.events, 3))],
  ]
})

function onPair(sample: Sample, pair: readonly [string, string]): boolean {
  const { red, black } = sample.state.meter
  return (red === pair[0] && black === pair[1]) || (red === pair[1] && black === pair[0])
}

describe('attempt trace', () => {
  it.each(traces)('%s: every sample reads the drive as readDrive reads its state', (_name, trace) => {
    for (const sample of trace.samples) expect(sample.drive).toEqual(readDrive(sample.state))
  })

  it.each(traces)('%s: a reading is shared only between samples of one moment', (_name, trace) => {
    const { samples } = trace
    for (let i = 1; i < samples.length; i++) {
      if (samples[i].drive === samples[i - 1].drive) expect(samples[i].t).toBe(samples[i - 1].t)
    }
  })

  it('shares the reading of a meter probe move with the moment before it when nothing else changed', () => {
    const [, trace] = traces.find(([name]) => name.endsWith('with probe moves'))!
    const changedParts = (before: Sample, after: Sample) =>
      (Object.keys(after.state) as (keyof Sample['state'])[]).filter(
        (k) => after.state[k] !== before.state[k],
      )
    // (A message left by the event before is cleared by the move: that changes the reading.)
    const probeMoves = trace.samples.filter((after) => {
      if (after.at !== 'after' || trace.events[after.eventIndex].type !== 'meter.probes') return false
      const before = trace.before(after.eventIndex)
      return (
        before.state.messages.length === 0 &&
        changedParts(before, after).every((k) => k === 'meter' || k === 'messages')
      )
    })
    expect(probeMoves.length).toBeGreaterThan(10)
    for (const after of probeMoves) expect(after.drive).toBe(trace.before(after.eventIndex).drive)
  })

  it('finds the first sample at or after a time, or after it, as a scan does', () => {
    const times = fc
      .array(fc.integer({ min: 0, max: 50 }), { maxLength: 40 })
      .map((ts) => ts.sort((a, b) => a - b))
    fc.assert(
      fc.property(times, fc.integer({ min: -5, max: 60 }), (ts, t) => {
        const samples = ts.map((time) => ({ t: time }) as Sample)
        const scan = (keep: (s: Sample) => boolean) => {
          const i = samples.findIndex(keep)
          return i === -1 ? samples.length : i
        }
        expect(firstSampleFrom(samples, t)).toBe(scan((s) => s.t >= t))
        expect(firstSampleFrom(samples, t, true)).toBe(scan((s) => s.t > t))
      }),
    )
  })

  it.each(traces)(
    '%s: terminal work is each wiring, contact or fuse event with the sample before it',
    (_name, trace) => {
      const scanned = trace.samples
        .filter((s) => s.at === 'before' && isTerminalWork(trace.events[s.eventIndex]))
        .map((s) => ({ t: s.t, eventIndex: s.eventIndex, event: trace.events[s.eventIndex], before: s }))
      expect(terminalWork(trace)).toEqual(scanned)
      expect(terminalWork(trace).every((w, i) => w.before === scanned[i].before)).toBe(true)
    },
  )

  it.each(traces)('%s: the lock in force and the isolation start agree with a scan back', (_name, trace) => {
    const lastBefore = (applied: number, type: string) =>
      trace.events.slice(0, applied).findLast((e) => e.type === type)?.t
    for (const sample of trace.samples) {
      const lockT = sample.state.power.locked ? (lastBefore(sample.applied, 'lock.applied') ?? 0) : undefined
      expect(lockInForce(trace, sample)).toBe(lockT)
      expect(isolationStart(trace, sample)).toBe(lockT ?? lastBefore(sample.applied, 'power.off') ?? 0)
    }
  })

  it.each(traces)('%s: dead tests and meter proofs agree with a scan of every sample', (_name, trace) => {
    const { samples } = trace
    const times = [...new Set(samples.map((s) => s.t))]
    // Both orders of a pair, a pair named twice, and a pair nobody measures.
    const pairs: (readonly [string, string])[] = [
      ...DEFAULT_DEAD_PAIRS,
      ['drive.l2', 'drive.l1'],
      ['drive.l1', 'drive.l2'],
      ['drive.p24', 'drive.0v'],
      ['drive.pe', 'drive.l3'],
    ]
    for (let i = 0; i < times.length; i += Math.max(1, Math.floor(times.length / 12))) {
      for (const to of [times[i], times[Math.min(times.length - 1, i + 5)], trace.end]) {
        const from = times[i]
        const expected = pairs.map((pair) => {
          let lowest: { volts: number; t: number } | undefined
          for (const s of samples) {
            // A dead test counts only on the range that shows what the pair could carry.
            if (s.t < from || s.t > to || !onPair(s, pair)) continue
            if (s.state.meter.mode !== voltageRangeFor(pair[0], pair[1])) continue
            const volts = trace.circuit(s).meter.volts
            if (volts !== null && (!lowest || Math.abs(volts) < lowest.volts))
              lowest = { volts: Math.abs(volts), t: s.t }
          }
          return { pair, lowest, proved: lowest !== undefined && lowest.volts < 50 }
        })
        expect(deadTests(trace, from, to, pairs, 50)).toEqual(expected)
        const proof = samples.find((s) => {
          const volts = s.t >= from && s.t <= to ? trace.circuit(s).meter.volts : null
          return volts !== null && Math.abs(volts) >= PROVING_VOLTS
        })
        const volts = proof && Math.abs(trace.circuit(proof).meter.volts!)
        expect(meterProved(trace, from, to)).toEqual(proof && { t: proof.t, volts })
      }
    }
  })
})
