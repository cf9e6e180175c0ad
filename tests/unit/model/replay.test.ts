// Replay: same log, same result; the timeline can be sampled at any time (scrubbing).
import { describe, expect, it } from 'vitest'
import {
  advance,
  applyEvent,
  attemptLogSchema,
  createSimulation,
  readDrive,
  replay,
  sampleTimeline,
  type AttemptEvent,
} from '../../../shared/model/index'
import { clearCircuitMemo } from '../../../shared/model/circuit/controlCircuit'
import { clearDriveMemo } from '../../../shared/model/driveTransitions'
import { mixedLog, benchSetup } from '../../bench/model.bench'
import { raiseLowerSetup } from './fixtures'

const commissioning: AttemptEvent[] = [
  { t: 1000, type: 'device.switched', device: 'runSel', position: 1 },
  { t: 2000, type: 'device.pressed', device: 'raisePb' },
  { t: 7000, type: 'device.released', device: 'raisePb' },
  { t: 9000, type: 'meter.probes', red: 'drive.p24', black: 'drive.0v' },
  { t: 12_000, type: 'device.pressed', device: 'lowerPb' },
  { t: 13_000, type: 'device.released', device: 'lowerPb' },
  { t: 15_000, type: 'device.switched', device: 'runSel', position: 0 },
  { t: 30_000, type: 'attempt.ended' },
]

describe('replay', () => {
  // Memos (circuit solutions, drive transitions) live outside the state and must never change results:
  // the same log gives the same JSON whatever was replayed before, and with every memo cleared.
  it('gives identical JSON whether the memos are cold or warmed by other logs and other panels', () => {
    // These two logs told cold from warm before drive-state identity stopped depending on the memo.
    const log = mixedLog(3000, 60_000, 2)
    clearCircuitMemo()
    clearDriveMemo()
    const cold = JSON.stringify(replay(benchSetup, log))
    clearCircuitMemo()
    clearDriveMemo()
    replay(raiseLowerSetup(), commissioning)
    replay(benchSetup, mixedLog(3000, 3_600_000, 1))
    expect(JSON.stringify(replay(benchSetup, log))).toBe(cold)
  })

  it('gives identical JSON for the same log replayed twice', () => {
    const a = JSON.stringify(replay(raiseLowerSetup(), commissioning))
    const b = JSON.stringify(replay(raiseLowerSetup(), commissioning))
    expect(a).toBe(b)
  })

  it('survives a JSON round trip and carries on identically from a deserialised state', () => {
    const timeline = replay(raiseLowerSetup(), commissioning.slice(0, 3))
    const last = timeline.segments[timeline.segments.length - 1].state
    const thawed = JSON.parse(JSON.stringify(last))
    const rest = commissioning.slice(3)
    const fromLive = rest.reduce(applyEvent, last)
    const fromThawed = rest.reduce(applyEvent, thawed)
    expect(JSON.stringify(fromThawed)).toBe(JSON.stringify(fromLive))
  })

  it('gives the same result as applying the events one by one', () => {
    const timeline = replay(raiseLowerSetup(), commissioning)
    const direct = commissioning.reduce(applyEvent, createSimulation(raiseLowerSetup()))
    expect(JSON.stringify(timeline.segments.at(-1)!.state)).toBe(JSON.stringify(direct))
  })

  it('has one segment per event after the starting one, and marks breakpoints in between', () => {
    const timeline = replay(raiseLowerSetup(), commissioning)
    expect(timeline.segments).toHaveLength(commissioning.length + 1)
    expect(timeline.segments[1].cause).toEqual({ kind: 'event', index: 0, type: 'device.switched' })
    // Reaching minimum speed after the start, and standstill at the end of the ramp stop.
    expect(timeline.breakpoints.map((b) => b.what)).toEqual(['speedReached', 'speedReached'])
    expect(timeline.breakpoints[0].t).toBeCloseTo(1500, 9) // 5 Hz at 50 Hz per 5 s
    expect(timeline.end).toBe(30_000)
  })

  it('samples the speed recorded at any moment (scrubbing) the same as advancing there', () => {
    const timeline = replay(raiseLowerSetup(), commissioning)
    const direct = advance(
      commissioning.slice(0, 3).reduce(applyEvent, createSimulation(raiseLowerSetup())),
      1500,
    )
    const sample = sampleTimeline(timeline, 8500)
    expect(sample.outputHz).toBe(readDrive(direct).outputHz)
    expect(sample.outputHz).toBeCloseTo(15, 9) // 5 Hz + 2 Hz/s × 5 s of raise
    expect(sample.circuit.inputs[0].on).toBe(true)
  })

  it('samples before the first event from the starting state', () => {
    expect(sampleTimeline(replay(raiseLowerSetup(), commissioning), 500).control).toBe('stopped')
  })

  it('replays a long generated mixed log deterministically', () => {
    const log = attemptLogSchema.parse(mixedLog(2000, 3_600_000, 3))
    const a = replay(benchSetup, log)
    const b = replay(benchSetup, log)
    expect(JSON.stringify(a.segments.at(-1)!.state)).toBe(JSON.stringify(b.segments.at(-1)!.state))
    expect(JSON.stringify(a.breakpoints)).toBe(JSON.stringify(b.breakpoints))
  })

  it('names a fractional event time as such', () => {
    expect(() => applyEvent(createSimulation(raiseLowerSetup()), { t: 1.5, type: 'power.off' })).toThrow(
      /whole milliseconds/,
    )
  })

  it('refuses events that go back in time', () => {
    expect(() =>
      replay(raiseLowerSetup(), [
        { t: 100, type: 'power.off' },
        { t: 50, type: 'power.on' },
      ]),
    ).toThrow(/before the simulation time/)
  })
})
