// Digital inputs and the control circuit, checked against IEC 61131-2 type 1 limits and the physics of
// sink/source wiring (figures: team REFERENCES.md, from IEC 61131-2 via Infineon KBA236229 / TI SLVAG20).
import { describe, expect, it } from 'vitest'
import { inputRegion, nextInputState, TYPE1_LIMITS } from '../../../shared/model/circuit/inputThresholds'
import { readCircuit, readDrive, type SimState } from '../../../shared/model/index'
import { raiseLowerSetup, run, start, wire } from './fixtures'

const input = (state: SimState, n: number) => readCircuit(state).inputs[n - 1]

describe('IEC 61131-2 type 1 limits for 24 V DC inputs', () => {
  it('uses the published OFF and ON limits', () => {
    // IEC 61131-2 type 1: OFF U ≤ 5 V or I ≤ 0.5 mA; ON U ≥ 15 V and I ≥ 2 mA (REFERENCES.md).
    expect(TYPE1_LIMITS).toEqual({ offMaxVolts: 5, offMaxMilliamps: 0.5, onMinVolts: 15, onMinMilliamps: 2 })
  })

  it('is OFF at or below 5 V whatever the current', () => {
    expect(inputRegion(5, 10)).toBe('off') // IEC 61131-2 type 1: U ≤ 5 V is OFF
  })

  it('is OFF at or below 0.5 mA even at 24 V', () => {
    expect(inputRegion(24, 0.5)).toBe('off') // IEC 61131-2 type 1: I ≤ 0.5 mA is OFF ("or": from memory)
  })

  it('is ON only with both 15 V and 2 mA', () => {
    expect(inputRegion(15, 2)).toBe('on') // IEC 61131-2 type 1: ON needs U ≥ 15 V and I ≥ 2 mA
    expect(inputRegion(15, 1.9)).toBe('transition')
    expect(inputRegion(14.9, 5)).toBe('transition')
  })

  it('keeps the previous state in the transition band (hysteresis, common practice)', () => {
    expect(nextInputState(true, 'transition')).toBe(true)
    expect(nextInputState(false, 'transition')).toBe(false)
  })
})

describe('sink wiring (common to 0 V, the contact switches +24 V into the input)', () => {
  it('turns the input ON with the contact closed, at about the supply voltage', () => {
    const s = run(start(), [{ t: 10, type: 'device.pressed', device: 'raisePb' }])
    const di2 = input(s, 2)
    expect(di2.on).toBe(true)
    // Contact drop is microvolts; the supply sags by its 0.5 Ω × a few mA.
    expect(di2.volts).toBeGreaterThan(23.9)
    // Opto input: I = (U − 1 V) / 4.7 kΩ ≈ 4.9 mA, inside the type 1 ON band (2–15 mA).
    expect(di2.milliamps).toBeCloseTo((di2.volts - 1) / 4.7, 3)
    expect(di2.milliamps).toBeGreaterThan(2)
  })

  it('leaves the input OFF with the contact open', () => {
    const di2 = input(start(), 2)
    expect(di2.on).toBe(false)
    expect(di2.region).toBe('off')
  })

  it('leaves every input OFF when the common is not wired (no return path)', () => {
    // REFERENCES.md: missing common → no current → OFF for every type (derived).
    const setup = raiseLowerSetup()
    const s = run(start({ ...setup, wires: setup.wires.filter((w) => w.id !== 'c') }), [
      { t: 10, type: 'device.pressed', device: 'raisePb' },
      { t: 10, type: 'device.switched', device: 'runSel', position: 1 },
    ])
    expect(readCircuit(s).inputs.map((i) => i.on)).toEqual([false, false, false, false, false, false])
    expect(input(s, 2).milliamps).toBeLessThan(0.001)
  })
})

describe('wiring for the wrong logic', () => {
  // Source-style wiring: DIC to +24 V, the contact switches the input to 0 V.
  const sourceWired = (logic: 'sink' | 'source') =>
    raiseLowerSetup({
      devices: [{ id: 'pb', kind: 'pushbutton', label: 'Test', contact: 'NO' }],
      wires: [
        wire('c', 'drive.dcom', 'drive.p24'),
        wire('a', 'drive.0v', 'pb.a'),
        wire('b', 'pb.b', 'drive.di4'),
      ],
      settings: { 'inputs.logic': logic },
    })

  it('leaves a source-wired input OFF on a drive set to sink (polarised opto input)', () => {
    // REFERENCES.md: a polarised (single-LED) input wired for the wrong logic stays OFF.
    const s = run(start(sourceWired('sink')), [{ t: 10, type: 'device.pressed', device: 'pb' }])
    expect(input(s, 4).on).toBe(false)
    expect(input(s, 4).milliamps).toBe(0)
  })

  it('turns the same wiring ON once the drive is set to source', () => {
    const s = run(start(sourceWired('source')), [{ t: 10, type: 'device.pressed', device: 'pb' }])
    expect(input(s, 4).on).toBe(true)
  })
})

describe('hysteresis on a slowly changing input voltage', () => {
  // A 1 kΩ potentiometer across +24 V / 0 V feeding DI5: the wiper sets the input voltage.
  const divider = raiseLowerSetup({
    devices: [{ id: 'pot', kind: 'potentiometer', label: 'Test divider', ohms: 1000, position: 1 }],
    wires: [
      wire('c', 'drive.dcom', 'drive.0v'),
      wire('h', 'drive.p24', 'pot.hi'),
      wire('l', 'pot.lo', 'drive.0v'),
      wire('w', 'pot.wiper', 'drive.di5'),
    ],
    settings: {},
  })
  const positionForTransition = 0.45

  it('puts the input in the transition band at the test position', () => {
    const s = run(start(divider), [
      { t: 10, type: 'device.turned', device: 'pot', position: positionForTransition },
    ])
    expect(input(s, 5).region).toBe('transition')
  })

  it('stays ON when the voltage falls into the band from above', () => {
    const s = run(start(divider), [
      { t: 10, type: 'device.turned', device: 'pot', position: positionForTransition },
    ])
    expect(input(s, 5).on).toBe(true)
  })

  it('stays OFF when the voltage rises into the band from below', () => {
    const s = run(start(divider), [
      { t: 10, type: 'device.turned', device: 'pot', position: 0 },
      { t: 20, type: 'device.turned', device: 'pot', position: positionForTransition },
    ])
    expect(input(s, 5).on).toBe(false)
  })
})

describe('the meter on the control circuit', () => {
  it('reads the supply across an open contact (less the input LED drop the meter current flows through)', () => {
    const s = run(start(), [
      { t: 0, type: 'meter.mode', mode: 'dcVolts' },
      { t: 10, type: 'meter.probes', red: 'raisePb.a', black: 'raisePb.b' },
    ])
    const meter = readCircuit(s).meter
    const supply = readCircuit(s).supplyVolts
    expect(meter.mode).toBe('dcVolts')
    // 10 MΩ meter in series with the opto input: about 2 µA, so the far side sits near the LED's 1 V.
    expect(meter.volts!).toBeGreaterThan(supply - 1.1)
    expect(meter.volts!).toBeLessThan(supply)
  })

  it('reads about 0 V across a closed contact', () => {
    const s = run(start(), [
      { t: 0, type: 'meter.mode', mode: 'dcVolts' },
      { t: 10, type: 'device.pressed', device: 'raisePb' },
      { t: 20, type: 'meter.probes', red: 'raisePb.a', black: 'raisePb.b' },
    ])
    expect(Math.abs(readCircuit(s).meter.volts!)).toBeLessThan(0.001)
  })

  it('reads about 0 V on a wire that goes nowhere', () => {
    const s = run(start(), [
      { t: 0, type: 'meter.mode', mode: 'dcVolts' },
      { t: 10, type: 'wire.added', id: 'loose', from: 'drive.di6', to: 'runSel.a', colour: 'blue' },
      { t: 20, type: 'wire.removed', id: 'r1' },
      { t: 30, type: 'meter.probes', red: 'drive.di6', black: 'drive.0v' },
    ])
    expect(Math.abs(readCircuit(s).meter.volts!)).toBeLessThan(0.5)
  })

  it('shows no reading with a probe lifted', () => {
    const s = run(start(), [
      { t: 0, type: 'meter.mode', mode: 'dcVolts' },
      { t: 10, type: 'meter.probes', red: 'drive.p24', black: null },
    ])
    expect(readCircuit(s).meter.volts).toBeNull()
  })
})

describe('the +24 V control supply', () => {
  it('folds back and trips the drive when +24 V is shorted to 0 V', () => {
    const s = run(start(), [
      { t: 10, type: 'wire.added', id: 'short', from: 'drive.p24', to: 'drive.0v', colour: 'blue' },
    ])
    const circuit = readCircuit(s)
    expect(circuit.supplyOverloaded).toBe(true)
    expect(circuit.supplyOn).toBe(false)
    expect(Math.abs(circuit.supplyVolts)).toBeLessThan(0.01)
    const drive = readDrive(s)
    expect(drive.tripped).toBe(true)
    expect(drive.faults.map((f) => f.code)).toEqual(['supplyOverload'])
    expect(drive.faults[0].text).toMatch(/control supply overloaded/i)
  })

  it('trips on a short through a closed contact too (the limit is 200 mA, common practice)', () => {
    const s = run(start(), [
      { t: 10, type: 'wire.added', id: 'short', from: 'raisePb.b', to: 'drive.0v', colour: 'blue' },
      { t: 20, type: 'device.pressed', device: 'raisePb' },
    ])
    expect(readCircuit(s).supplyOverloaded).toBe(true)
    expect(readDrive(s).faults.map((f) => f.code)).toContain('supplyOverload')
  })

  it('is dead with a blown fuse until the fuse is replaced', () => {
    const blown = start(raiseLowerSetup({ faults: [{ kind: 'blownFuse' }] }))
    const pressed = run(blown, [{ t: 10, type: 'device.pressed', device: 'raisePb' }])
    expect(readCircuit(pressed).supplyOn).toBe(false)
    expect(input(pressed, 2).on).toBe(false)
    const fixed = run(pressed, [{ t: 20, type: 'fuse.replaced' }])
    expect(input(fixed, 2).on).toBe(true)
  })
})
