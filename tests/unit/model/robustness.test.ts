// Random attempts (fast-check) never break the model: no exception, readings within physical bounds,
// and replay stays deterministic.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import {
  readCircuit,
  readDrive,
  replay,
  type AttemptEvent,
  type SimulationSetup,
} from '../../../shared/model/index'
import { raiseLowerSetup, wire } from './fixtures'

const base = raiseLowerSetup()
const setup: SimulationSetup = {
  ...base,
  devices: [
    ...base.devices,
    { id: 'pot', kind: 'potentiometer', label: 'Speed', ohms: 10_000, position: 0.3 },
  ],
  wires: [
    ...base.wires,
    wire('p1', 'drive.p10', 'pot.hi'),
    wire('p2', 'pot.wiper', 'drive.ai'),
    wire('p3', 'pot.lo', 'drive.acom'),
  ],
  settings: { ...base.settings, 'direction.reverseAllowed': true },
  machine: { coastSeconds: 3, minDecelSeconds: 2 },
}

const points = [
  'drive.p24',
  'drive.0v',
  'drive.dcom',
  'drive.di1',
  'drive.di2',
  'drive.di3',
  'drive.di4',
  'drive.ai',
  'drive.p10',
  'runSel.a',
  'runSel.b',
  'raisePb.b',
  'lowerPb.b',
  'pot.wiper',
]
const point = fc.constantFrom(...points)
const meterPoint = fc.constantFrom(
  ...points,
  'drive.l1',
  'drive.pe',
  'drive.dcp',
  'drive.u',
  'drive.w',
  'motor.v1',
  'prover.pos',
  'prover.ac',
)

const eventArb: fc.Arbitrary<Omit<AttemptEvent, 't'>> = fc.oneof(
  fc.record({
    type: fc.constantFrom('device.pressed', 'device.released'),
    device: fc.constantFrom('raisePb', 'lowerPb'),
  }),
  fc.record({
    type: fc.constant('device.switched'),
    device: fc.constant('runSel'),
    position: fc.constantFrom(0, 1),
  }),
  fc.record({
    type: fc.constant('device.turned'),
    device: fc.constant('pot'),
    position: fc.double({ min: 0, max: 1, noNaN: true }),
  }),
  fc.record({
    type: fc.constant('wire.added'),
    id: fc.constantFrom('x1', 'x2', 'x3'),
    from: point,
    to: point,
    colour: fc.constant('blue'),
  }),
  fc.record({ type: fc.constant('wire.removed'), id: fc.constantFrom('x1', 'x2', 'r2', 'c', 'u2') }),
  fc.record({
    type: fc.constant('setting.changed'),
    key: fc.constantFrom(
      'di3.function',
      'reference.remoteSource',
      'stop.mode',
      'ramp.decelSeconds',
      'speed.max',
      'raiseLower.bothHeld',
    ),
    value: fc.constantFrom(
      'reverse',
      'lower',
      'analog',
      'raiseLower',
      'coast',
      'ramp',
      1,
      8,
      30,
      'firstWins',
      'hold',
    ),
  }),
  fc.record({ type: fc.constant('settings.saved') }),
  fc.record({ type: fc.constantFrom('power.on', 'power.off', 'fuse.replaced') }),
  fc.record({ type: fc.constant('keypad.key'), key: fc.constantFrom('run', 'stop', 'reset', 'up') }),
  fc.record({ type: fc.constant('meter.probes'), red: meterPoint, black: meterPoint }),
  fc.record({
    type: fc.constant('meter.mode'),
    mode: fc.constantFrom('off', 'acVolts', 'dcVolts', 'resistance', 'continuity'),
  }),
  fc.record({
    type: fc.constant('motor.conductorLanded'),
    conductor: fc.constantFrom('u', 'v', 'w'),
    terminal: fc.constantFrom('u1', 'v1', 'w1', null),
  }),
  fc.record({ type: fc.constant('motor.cableReplaced') }),
) as fc.Arbitrary<Omit<AttemptEvent, 't'>>

const logArb = fc
  .array(fc.tuple(fc.integer({ min: 0, max: 20_000 }), eventArb), { maxLength: 60 })
  .map((items) => {
    let t = 0
    return items.map(([gap, event]) => ({ ...event, t: (t += gap) }) as AttemptEvent)
  })

describe('random attempts', () => {
  it('never throw, and keep readings within physical bounds', () => {
    fc.assert(
      fc.property(logArb, (log) => {
        const timeline = replay(setup, log)
        for (const segment of timeline.segments) {
          const drive = readDrive(segment.state)
          const max = segment.state.settings.active['speed.max']
          expect(drive.outputHz).toBeLessThanOrEqual(max + 1e-6)
          expect(drive.busVolts).toBeGreaterThanOrEqual(0)
          expect(drive.busVolts).toBeLessThan(541)
          expect(drive.outputVolts).toBeLessThanOrEqual(segment.state.lineVolts + 1e-9)
          expect(drive.outputAmps).toBeGreaterThanOrEqual(0)
          if (drive.outputAmps > 0) expect(drive.outputOn).toBe(true)
          const circuit = readCircuit(segment.state)
          expect(Math.abs(circuit.supplyVolts)).toBeLessThanOrEqual(24 + 1e-9)
          for (const input of circuit.inputs) expect(input.milliamps).toBeLessThan(5.2)
          const meter = circuit.meter
          if (meter.ohms !== null) expect(meter.ohms).toBeGreaterThanOrEqual(0)
          if (meter.volts !== null) expect(Math.abs(meter.volts)).toBeLessThan(541)
          if (meter.tone) expect(meter.mode).toBe('continuity')
        }
      }),
      { numRuns: 150 },
    )
  }, 60_000)

  it('replay twice gives identical JSON', () => {
    fc.assert(
      fc.property(logArb, (log) => {
        expect(JSON.stringify(replay(setup, log))).toBe(JSON.stringify(replay(setup, log)))
      }),
      { numRuns: 40 },
    )
  }, 60_000)
})
