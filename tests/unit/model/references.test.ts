// Reference sources other than raise/lower, direction, and the relay output.
import { describe, expect, it } from 'vitest'
import { advance, readCircuit, readDrive, type SimulationSetup } from '../../../shared/model/index'
import { hz, raiseLowerSetup, run, start, wire } from './fixtures'

function withPot(settings: SimulationSetup['settings'] = {}, extraWires = [] as ReturnType<typeof wire>[]) {
  const base = raiseLowerSetup()
  return start({
    ...base,
    devices: [
      ...base.devices,
      { id: 'speedPot', kind: 'potentiometer', label: 'Speed', ohms: 10_000, position: 0.5 },
    ],
    wires: [
      ...base.wires,
      wire('p1', 'drive.p10', 'speedPot.hi'),
      wire('p2', 'speedPot.wiper', 'drive.ai'),
      wire('p3', 'speedPot.lo', 'drive.acom'),
      ...extraWires,
    ],
    settings: {
      ...base.settings,
      'reference.remoteSource': 'analog',
      'di2.function': 'none',
      'di3.function': 'none',
      'speed.min': 0,
      ...settings,
    },
  })
}

describe('analog reference (0–10 V scaled between minimum and maximum speed)', () => {
  it('reads the +10 V reference and scales the wiper voltage', () => {
    const s = withPot()
    const circuit = readCircuit(s)
    expect(circuit.referenceVolts).toBeCloseTo(10, 1)
    // A 10 kΩ pot at mid-travel loaded by the 20 kΩ input: V = 10·(5k‖20k)/(5k + 5k‖20k) ≈ 4.44 V.
    const loaded = (10 * (1 / (1 / 5000.5 + 1 / 20_000))) / (5000.5 + 1 / (1 / 5000.5 + 1 / 20_000))
    expect(circuit.analogVolts).toBeCloseTo(loaded, 2)
    expect(readDrive(s).referenceHz).toBeCloseTo((loaded / 10) * 50, 1)
  })

  it('runs at the speed the potentiometer sets', () => {
    const s = run(withPot(), [
      { t: 0, type: 'device.turned', device: 'speedPot', position: 1 },
      { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    // Full travel: 10 V less the drop in the reference's 10 Ω and the pot's end resistance → 49.9 Hz.
    expect(hz(advance(s, 10_000))).toBeGreaterThan(49.8)
  })

  it('folds the +10 V reference back and raises an alarm when it is shorted', () => {
    const s = withPot({}, [wire('short', 'drive.p10', 'drive.acom')])
    expect(readCircuit(s).referenceOverloaded).toBe(true)
    expect(readDrive(s).alarms.map((a) => a.code)).toContain('referenceSupplyOverload')
    expect(readDrive(s).tripped).toBe(false)
  })
})

describe('preset speed input', () => {
  it('runs at the preset speed while the preset input is ON', () => {
    const s = run(
      withPot({ 'di3.function': 'preset', 'preset.speed1': 12 }, [wire('x1', 'drive.p24', 'lowerPb.a')]),
      [
        { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
        { t: 0, type: 'device.pressed', device: 'lowerPb' },
      ],
    )
    expect(hz(advance(s, 10_000))).toBeCloseTo(12, 9)
  })
})

describe('direction', () => {
  const reversible = () => withPot({ 'di3.function': 'reverse', 'direction.reverseAllowed': true }, [])

  it('ramps down through zero and up the other way when reverse is selected while running', () => {
    const running = advance(
      run(reversible(), [
        { t: 0, type: 'device.turned', device: 'speedPot', position: 1 },
        { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
      ]),
      6000,
    )
    const reversing = run(running, [{ t: 6000, type: 'device.pressed', device: 'lowerPb' }])
    expect(readDrive(reversing).control).toBe('decelerating')
    expect(readDrive(advance(reversing, 5000 * 0.5)).direction).toBe('reverse')
    const reversed = advance(reversing, 20_000)
    expect(readDrive(reversed).speedRpm).toBeLessThan(0)
    expect(readDrive(reversed).outputHz).toBeGreaterThan(49.8)
  })

  it('ignores reverse when reverse is not allowed, and says so', () => {
    const s = withPot({ 'di3.function': 'reverse' })
    expect(readDrive(s).alarms.map((a) => a.code)).toContain('reverseNotAllowed')
  })
})

describe('relay output', () => {
  it('closes K1A–K1B while running, and can feed an input back', () => {
    const s = run(
      start(
        raiseLowerSetup({
          wires: [
            ...raiseLowerSetup().wires,
            wire('k1', 'drive.p24', 'drive.k1a'),
            wire('k2', 'drive.k1b', 'drive.di6'),
          ],
        }),
      ),
      [{ t: 0, type: 'device.switched', device: 'runSel', position: 1 }],
    )
    expect(readDrive(s).relayClosed).toBe(true)
    expect(readCircuit(s).inputs[5].on).toBe(true)
    const stopped = advance(
      run(s, [{ t: 1000, type: 'device.switched', device: 'runSel', position: 0 }]),
      5000,
    )
    expect(readDrive(stopped).relayClosed).toBe(false)
    expect(readCircuit(stopped).inputs[5].on).toBe(false)
  })
})
