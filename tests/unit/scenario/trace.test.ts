// The sample stream the objectives read, one event at a time: drive readings made on first use (and
// shared between the samples of one moment), the supply state shared while the circuit is configured
// alike, the lock each moment falls under, and the dead-test readings kept since each isolation start.
// Each must give exactly what the plain definition gives: the model's own replay, or a scan of every
// sample so far.
import { describe, expect, it } from 'vitest'
import {
  readCircuit,
  readDrive,
  replay,
  voltageRangeFor,
  type AttemptEvent,
  type MeterMode,
  type PointId,
} from '@shared/model'
import { toSimulationSetup } from '@shared/scenario'
import { DEFAULT_DEAD_PAIRS, DeadTestWatcher, PROVING_VOLTS, type ProbePair } from '@shared/scenario/proofs'
import { isolationStart, lockInForce } from '@shared/scenario/safety'
import { AttemptSampler, type Sample } from '@shared/scenario/samples'
import { attemptFixtures, shippedScenario } from './helpers'

const fixtures = attemptFixtures()

const PROBE_POINTS: (PointId | null)[] = ['drive.p24', 'drive.0v', 'drive.l1', 'drive.l2', 'drive.dcp', null]
const RANGES: MeterMode[] = ['acVolts', 'dcVolts', 'resistance']

/** The log with meter probe moves between its events, as a long attempt has them, and the range turned now and then. */
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
      if (k === 1 && i % 3 === 0) out.push({ t, type: 'meter.mode', mode: RANGES[i % RANGES.length]! })
      out.push({ t, type: 'meter.probes', red, black })
    }
  })
  return out
}

interface Streamed {
  events: AttemptEvent[]
  samples: Sample[]
  setup: ReturnType<typeof toSimulationSetup>
}

function stream(setup: Streamed['setup'], events: AttemptEvent[]): Streamed {
  const sampler = new AttemptSampler(setup)
  const samples = [sampler.start]
  for (const event of events) samples.push(...sampler.push(event))
  return { events, samples, setup }
}

const streams: [string, Streamed][] = fixtures.flatMap((fixture) => {
  const setup = toSimulationSetup(shippedScenario(fixture.scenario))
  const name = `${fixture.scenario}--${fixture.name}`
  return [
    [name, stream(setup, fixture.events)],
    [`${name} with probe moves`, stream(setup, withProbeMoves(fixture.events, 3))],
  ]
})

function onPair(sample: Sample, pair: ProbePair): boolean {
  const { red, black } = sample.state.meter
  return (red === pair[0] && black === pair[1]) || (red === pair[1] && black === pair[0])
}

describe('attempt sample stream', () => {
  it.each(streams)(
    '%s: each event has one sample just before and one just after it, as replay has it',
    (_n, s) => {
      const timeline = replay(s.setup, s.events)
      const befores = s.samples.filter((x) => x.at === 'before')
      const afters = s.samples.filter((x) => x.at === 'after')
      expect(befores.map((x) => x.eventIndex)).toEqual(s.events.map((_, i) => i))
      expect(afters.map((x) => x.eventIndex)).toEqual(s.events.map((_, i) => i))
      s.events.forEach((event, i) => {
        expect(befores[i]!.t).toBe(event.t)
        expect(befores[i]!.event).toBe(event)
        expect(befores[i]!.applied).toBe(i)
        expect(afters[i]!.state).toEqual(timeline.segments[i + 1]!.state)
        expect(afters[i]!.applied).toBe(i + 1)
      })
    },
  )

  it.each(streams)('%s: samples are in time order, breakpoints strictly between events', (_n, s) => {
    const breakpoints = replay(s.setup, s.events).breakpoints.map((b) => Math.ceil(b.t))
    for (let i = 1; i < s.samples.length; i++)
      expect(s.samples[i]!.t).toBeGreaterThanOrEqual(s.samples[i - 1]!.t)
    for (const [i, sample] of s.samples.entries()) {
      if (sample.at !== 'breakpoint') continue
      expect(breakpoints).toContain(sample.t)
      expect(sample.t).toBeGreaterThan(s.samples[i - 1]!.t)
      expect(s.samples[i + 1]!.t).toBeGreaterThan(sample.t)
    }
  })

  it.each(streams)(
    '%s: every sample reads the drive and the supply as the model reads its state',
    (_n, s) => {
      for (const sample of s.samples) {
        expect(sample.drive).toEqual(readDrive(sample.state))
        expect(sample.supplyOn).toBe(readCircuit(sample.state).supplyOn)
      }
    },
  )

  it.each(streams)('%s: a reading is shared only between samples of one moment', (_n, s) => {
    for (let i = 1; i < s.samples.length; i++) {
      if (s.samples[i]!.drive === s.samples[i - 1]!.drive) expect(s.samples[i]!.t).toBe(s.samples[i - 1]!.t)
    }
  })

  it('shares the reading of a meter probe move with the moment before it when nothing else changed', () => {
    const [, s] = streams.find(([name]) => name.endsWith('with probe moves'))!
    const probeMoves = s.samples.flatMap((after, i) => {
      if (after.at !== 'after' || after.event?.type !== 'meter.probes') return []
      const before = s.samples[i - 1]!
      const changed = (Object.keys(after.state) as (keyof Sample['state'])[]).filter(
        (k) => after.state[k] !== before.state[k],
      )
      // (A message left by the event before is cleared by the move: that changes the reading.)
      const alike =
        before.state.messages.length === 0 && changed.every((k) => k === 'meter' || k === 'messages')
      return alike ? [[before, after] as const] : []
    })
    expect(probeMoves.length).toBeGreaterThan(10)
    for (const [before, after] of probeMoves) expect(after.drive).toBe(before.drive)
  })

  it.each(streams)('%s: the lock in force and the isolation start agree with a scan back', (_n, s) => {
    const lastBefore = (applied: number, type: string) =>
      s.events.slice(0, applied).findLast((e) => e.type === type)?.t
    for (const sample of s.samples) {
      const lockT = sample.state.power.locked ? (lastBefore(sample.applied, 'lock.applied') ?? 0) : undefined
      expect(lockInForce(sample)).toBe(lockT)
      expect(isolationStart(sample)).toBe(lockT ?? lastBefore(sample.applied, 'power.off') ?? 0)
    }
  })

  it.each(streams)(
    '%s: dead-test readings and meter proofs agree with a scan of every sample so far',
    (_n, s) => {
      // Both orders of a pair, a pair named twice, and a pair nobody measures.
      const pairs: ProbePair[] = [
        ...DEFAULT_DEAD_PAIRS,
        ['drive.l2', 'drive.l1'],
        ['drive.l1', 'drive.l2'],
        ['drive.p24', 'drive.0v'],
        ['drive.pe', 'drive.l3'],
      ]
      const watcher = new DeadTestWatcher(pairs, true)
      let watch = watcher.empty
      const volts = (sample: Sample) => readCircuit(sample.state).meter.volts
      const isProof = (sample: Sample) => {
        const v = volts(sample)
        return v !== null && Math.abs(v) >= PROVING_VOLTS
      }
      const every = Math.max(1, Math.floor(s.samples.length / 40))
      s.samples.forEach((sample, n) => {
        watch = watcher.step(watch, sample)
        if (n % every !== 0 && !(sample.at === 'before' && sample.event?.type.startsWith('wire'))) return
        const seen = s.samples.slice(0, n + 1)
        const firstProof = seen.find(isProof)
        expect(watch.firstProof).toEqual(
          firstProof && { t: firstProof.t, volts: Math.abs(volts(firstProof)!) },
        )
        for (const from of new Set([
          0,
          isolationStart(sample),
          sample.isolation.lastLockT ?? 0,
          sample.isolation.lastOffT ?? 0,
        ])) {
          const window = seen.filter((x) => x.t >= from)
          const lowest = pairs.map((pair) => {
            let low: { volts: number; t: number } | undefined
            for (const x of window) {
              // A dead test counts only on the range that shows what the pair could carry.
              const onRange = x.state.meter.mode === voltageRangeFor(pair[0], pair[1])
              const v = onRange && onPair(x, pair) ? volts(x) : null
              if (v !== null && (!low || Math.abs(v) < low.volts)) low = { volts: Math.abs(v), t: x.t }
            }
            return low
          })
          const since = watcher.since(watch, from)
          expect(since.lowest).toEqual(lowest)
          const lastDead = Math.max(...lowest.map((l) => l?.t ?? -1))
          if (lastDead >= 0) {
            const proof = window.find((x) => x.t >= lastDead && isProof(x))
            expect(since.proofAfterDead).toEqual(proof && { t: proof.t, volts: Math.abs(volts(proof)!) })
          }
        }
      })
    },
  )
})
