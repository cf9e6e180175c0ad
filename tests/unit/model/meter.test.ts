// The bench multimeter as an instrument: what each selector position shows, from the physics of the
// circuits it is put on (line, DC bus, drive output, motor, control circuit, proving unit).
import { describe, expect, it } from 'vitest'
import {
  advance,
  applyEvent,
  CONTINUITY_TONE_OHMS,
  INPUT_OHMS_AT_24V,
  readCircuit,
  readDrive,
  voltageRangeFor,
  windingOhms,
  type AttemptEvent,
  type MeterMode,
  type MeterReading,
  type SimState,
} from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

/** Turn the selector, place the probes, read the meter (at the state's own time). */
function read(s: SimState, mode: MeterMode, red: string | null, black: string | null): MeterReading {
  const events: AttemptEvent[] = [
    { t: s.t, type: 'meter.mode', mode },
    { t: s.t, type: 'meter.probes', red, black },
  ]
  return readCircuit(run(s, events)).meter
}

const live = () => start()
/** Switched off and left 30 minutes: the bus has bled down to about nothing. */
const dead = () => advance(run(start(), [{ t: 0, type: 'power.off' }]), 30 * 60_000)
/** Running forward at 25 Hz (raise/lower wiring, reference raised from the 5 Hz minimum). */
function runningAt25Hz(): SimState {
  let s = run(start(), [
    { t: 0, type: 'device.switched', device: 'runSel', position: 1 },
    { t: 10, type: 'device.pressed', device: 'raisePb' },
  ])
  s = advance(s, 10_000) // 2 Hz/s for 10 s: 5 → 25 Hz
  s = applyEvent(s, { t: s.t, type: 'device.released', device: 'raisePb' })
  return advance(s, 10_000)
}

describe('the selector', () => {
  it('starts off: the window is blank whatever the probes touch', () => {
    const m = readCircuit(
      run(live(), [{ t: 0, type: 'meter.probes', red: 'drive.l1', black: 'drive.l2' }]),
    ).meter
    expect(m.mode).toBe('off')
    expect(m.shows).toBe('blank')
    expect(m.volts).toBeNull()
  })

  it('keeps the probes where they are when it is turned, and the range when the probes move', () => {
    const s = run(live(), [
      { t: 0, type: 'meter.probes', red: 'drive.l1', black: 'drive.l2' },
      { t: 10, type: 'meter.mode', mode: 'acVolts' },
      { t: 20, type: 'meter.probes', red: 'drive.l2', black: 'drive.l3' },
    ])
    expect(s.meter).toEqual({ red: 'drive.l2', black: 'drive.l3', mode: 'acVolts' })
    expect(readCircuit(s).meter.volts!).toBeCloseTo(400, 6)
  })

  it('does not disturb the drive (a meter event needs no settling and changes no drive reading)', () => {
    const before = live()
    const after = run(before, [{ t: 0, type: 'meter.mode', mode: 'resistance' }])
    expect(readDrive(after)).toEqual(readDrive(before))
  })
})

describe('V AC and V DC on the supply and the DC bus (true-RMS, AC-coupled meter; DC range averages)', () => {
  it.each([
    ['drive.l1', 'drive.l2'],
    ['drive.l2', 'drive.l3'],
    ['drive.l1', 'drive.l3'],
  ])('reads the 400 V line on V AC from %s to %s (IEC 60038: 230/400 V system)', (red, black) => {
    expect(read(live(), 'acVolts', red, black).volts!).toBeCloseTo(400, 6)
  })

  it.each([['drive.l1'], ['drive.l2'], ['drive.l3']])(
    'reads phase to earth 400/√3 ≈ 231 V on V AC from %s to PE (IEC 60038: 230/400 V)',
    (phase) => {
      expect(read(live(), 'acVolts', phase, 'drive.pe').volts!).toBeCloseTo(400 / Math.sqrt(3), 4)
    },
  )

  it('reads about 0 V on V DC across the live line: a sine averages to zero (common practice)', () => {
    const m = read(live(), 'dcVolts', 'drive.l1', 'drive.l2')
    expect(m.shows).toBe('volts')
    expect(Math.abs(m.volts!)).toBeLessThan(0.01)
  })

  it('reads the bus on V DC and about 0 V on V AC across DC+ and DC− (the AC range blocks DC)', () => {
    const bus = readDrive(live()).busVolts
    expect(read(live(), 'dcVolts', 'drive.dcp', 'drive.dcn').volts!).toBeCloseTo(bus, 4)
    expect(read(live(), 'acVolts', 'drive.dcp', 'drive.dcn').volts!).toBeLessThan(0.01)
  })

  it('reads a negative DC voltage with the probes the other way round', () => {
    const bus = readDrive(live()).busVolts
    expect(read(live(), 'dcVolts', 'drive.dcn', 'drive.dcp').volts!).toBeCloseTo(-bus, 4)
  })

  it('reads 0 V on the line once the disconnect is off while the bus still holds its charge', () => {
    const s = advance(run(start(), [{ t: 0, type: 'power.off' }]), 10_000)
    expect(read(s, 'acVolts', 'drive.l1', 'drive.l2').volts).toBe(0)
    expect(read(s, 'acVolts', 'drive.l1', 'drive.pe').volts).toBe(0)
    expect(read(s, 'dcVolts', 'drive.dcp', 'drive.dcn').volts!).toBeGreaterThan(200)
  })

  it('reads about 0 V on the bus after the discharge time', () => {
    expect(read(dead(), 'dcVolts', 'drive.dcp', 'drive.dcn').volts!).toBeLessThan(1)
  })

  it('reads nothing between the isolated control circuit and a power terminal', () => {
    const m = read(live(), 'dcVolts', 'drive.p24', 'drive.l1')
    expect(m.floating).toBe(true)
    expect(m.volts).toBe(0)
  })

  it('shows no value with a probe lifted', () => {
    const m = read(live(), 'acVolts', 'drive.l1', null)
    expect(m.shows).toBe('volts')
    expect(m.volts).toBeNull()
  })
})

describe('the range a dead test needs', () => {
  it.each([
    ['drive.l1', 'drive.l2', 'acVolts'],
    ['drive.l3', 'drive.pe', 'acVolts'],
    ['drive.u', 'drive.v', 'acVolts'],
    ['motor.u1', 'drive.pe', 'acVolts'],
    ['drive.dcp', 'drive.dcn', 'dcVolts'],
    ['drive.dcp', 'drive.pe', 'dcVolts'],
    ['drive.p24', 'drive.0v', 'dcVolts'],
    ['prover.pos', 'prover.neg', 'dcVolts'],
    ['prover.ac', 'prover.neg', 'acVolts'],
  ])('is the one that shows what %s–%s could carry: %s', (red, black, range) => {
    expect(voltageRangeFor(red, black)).toBe(range)
    // …and on that range a live pair reads its voltage (the other range may read about nothing).
    if (!red.startsWith('prover')) return
    expect(Math.abs(read(live(), range as MeterMode, red, black).volts!)).toBeGreaterThan(100)
  })
})

describe('the proving unit (a known live source: NFPA 70E 120.5(7); OSHA 1910.147(d)(6))', () => {
  it('is live with the drive isolated and discharged, on both its outputs', () => {
    expect(read(dead(), 'dcVolts', 'prover.pos', 'prover.neg').volts).toBe(110)
    expect(read(dead(), 'acVolts', 'prover.ac', 'prover.neg').volts).toBe(230)
  })

  it('proves each range only on its own output: DC reads ~0 on V AC, AC reads ~0 on V DC', () => {
    expect(read(dead(), 'acVolts', 'prover.pos', 'prover.neg').volts).toBe(0)
    expect(read(dead(), 'dcVolts', 'prover.ac', 'prover.neg').volts).toBe(0)
  })

  it('reads nothing between the proving unit and the drive', () => {
    expect(read(live(), 'dcVolts', 'prover.pos', 'drive.l1').floating).toBe(true)
  })
})

describe('V AC on the drive output and the motor terminals', () => {
  it('reads the output voltage phase to phase and ÷√3 to earth while running; 0 V when stopped', () => {
    const s = runningAt25Hz()
    const drive = readDrive(s)
    expect(drive.outputHz).toBeCloseTo(25, 6)
    expect(read(s, 'acVolts', 'drive.u', 'drive.v').volts!).toBeCloseTo(drive.outputVolts, 4)
    expect(read(s, 'acVolts', 'drive.w', 'drive.u').volts!).toBeCloseTo(drive.outputVolts, 4)
    expect(read(s, 'acVolts', 'drive.v', 'drive.pe').volts!).toBeCloseTo(drive.outputVolts / Math.sqrt(3), 4)
    expect(read(live(), 'acVolts', 'drive.u', 'drive.v').volts).toBe(0)
  })

  it('finds the same voltage at the motor terminals through an intact cable', () => {
    const s = runningAt25Hz()
    expect(read(s, 'acVolts', 'motor.u1', 'motor.w1').volts!).toBeCloseTo(readDrive(s).outputVolts, 4)
    expect(read(s, 'acVolts', 'drive.u', 'motor.u1').volts!).toBeLessThan(1e-6)
  })
})

describe('resistance, with the circuit de-energised (isolated and discharged)', () => {
  const isolated = () => run(dead(), [{ t: dead().t, type: 'lock.applied' }])

  it('reads about 0 Ω across a closed contact (contact resistance of a few mΩ, from memory: < 50 mΩ)', () => {
    const s = run(isolated(), [{ t: isolated().t, type: 'device.switched', device: 'runSel', position: 1 }])
    const m = read(s, 'resistance', 'runSel.a', 'runSel.b')
    expect(m.shows).toBe('ohms')
    expect(m.ohms!).toBeLessThan(0.05)
  })

  it('reads over-range (OL) across an open contact that nothing else bridges', () => {
    const setup = raiseLowerSetup({ wires: [], power: { on: false, locked: true } })
    const m = read(start(setup), 'resistance', 'runSel.a', 'runSel.b')
    expect(m.shows).toBe('overRange')
    expect(m.ohms).toBeNull()
  })

  it('reads over-range along a broken conductor, and about 0 Ω along a good one', () => {
    const setup = raiseLowerSetup({
      power: { on: false, locked: true },
      faults: [{ kind: 'brokenWire', wireId: 'r2' }],
    })
    expect(read(start(setup), 'resistance', 'runSel.b', 'drive.di1').shows).toBe('overRange')
    expect(read(start(setup), 'resistance', 'drive.p24', 'runSel.a').ohms).toBe(0)
  })

  it('reads an input to its common as the input resistance at 24 V: 24 V ÷ 4.89 mA ≈ 4.9 kΩ', () => {
    // IEC 61131-2 type 1 (REFERENCES.md; Infineon KBA236229): ON at 24 V means 2–15 mA, i.e. 1.6–12 kΩ.
    const ohms = read(isolated(), 'resistance', 'drive.di4', 'drive.dcom').ohms!
    expect(ohms).toBeCloseTo(INPUT_OHMS_AT_24V, 3)
    expect(ohms).toBeCloseTo((24 * 4700) / 23, 3)
    const milliampsAt24V = (24 / ohms) * 1000
    expect(milliampsAt24V).toBeGreaterThanOrEqual(2)
    expect(milliampsAt24V).toBeLessThanOrEqual(15)
  })

  it('reads the analog input to its common as its 20 kΩ input resistance', () => {
    expect(read(isolated(), 'resistance', 'drive.ai', 'drive.acom').ohms!).toBeCloseTo(20_000, 3)
  })

  it('reads a potentiometer end to end as its track, and the wiper in proportion', () => {
    const setup = raiseLowerSetup({
      devices: [{ id: 'pot', kind: 'potentiometer', label: 'Speed', ohms: 10_000, position: 0.25 }],
      wires: [],
      power: { on: false, locked: true },
    })
    expect(read(start(setup), 'resistance', 'pot.hi', 'pot.lo').ohms!).toBeCloseTo(10_001, 6)
    expect(read(start(setup), 'resistance', 'pot.wiper', 'pot.lo').ohms!).toBeCloseTo(2500.5, 6)
  })

  it('reads the winding resistance phase to phase at the drive output through the cable', () => {
    const s = isolated()
    const winding = windingOhms(s.motor.nameplate)
    expect(winding).toBeGreaterThan(0.1)
    for (const [a, b] of [
      ['drive.u', 'drive.v'],
      ['drive.v', 'drive.w'],
      ['drive.u', 'drive.w'],
    ])
      expect(read(s, 'resistance', a, b).ohms!).toBeCloseTo(winding + 2 * 0.1, 3)
  })

  it('reads the same phase to phase whether the motor is connected star or delta', () => {
    // Star: R_LL/2 per phase, two in series; delta: 1.5·R_LL per phase, one in parallel with two in series.
    const plate = (connection: 'star' | 'delta') =>
      start(
        raiseLowerSetup({
          power: { on: false, locked: true },
          motor: {
            serial: 'T-SD',
            ratedVolts: 400,
            ratedHz: 50,
            ratedPower: 5.5,
            powerUnit: 'kW',
            fullLoadAmps: 10.7,
            powerFactor: 0.83,
            efficiencyPercent: 89.6,
            connection,
            ratedRpm: 1460,
            duty: 'S1',
          },
        }),
      )
    const star = read(plate('star'), 'resistance', 'motor.u1', 'motor.v1').ohms!
    const delta = read(plate('delta'), 'resistance', 'motor.u1', 'motor.v1').ohms!
    expect(star).toBeCloseTo(delta, 4)
    expect(star).toBeCloseTo(windingOhms(plate('star').motor.nameplate), 4)
  })

  it('reads the line terminals as open to each other and to earth (nothing joins them with the supply off)', () => {
    expect(read(isolated(), 'resistance', 'drive.l1', 'drive.l2').shows).toBe('overRange')
    expect(read(isolated(), 'resistance', 'drive.l1', 'drive.pe').shows).toBe('overRange')
  })

  it('reads 0 Ω with both probes on one terminal', () => {
    expect(read(isolated(), 'resistance', 'drive.0v', 'drive.0v').ohms).toBe(0)
  })
})

describe('continuity (our threshold: tone below 30 Ω; meters commonly beep below 10–50 Ω, from memory)', () => {
  const isolated = () => run(dead(), [{ t: dead().t, type: 'lock.applied' }])

  it('sounds across a closed contact and a motor winding', () => {
    const s = run(isolated(), [{ t: isolated().t, type: 'device.pressed', device: 'raisePb' }])
    const contact = read(s, 'continuity', 'raisePb.a', 'raisePb.b')
    expect(contact.tone).toBe(true)
    const winding = read(s, 'continuity', 'drive.u', 'drive.w')
    expect(winding.ohms!).toBeLessThan(CONTINUITY_TONE_OHMS)
    expect(winding.tone).toBe(true)
  })

  it('stays silent across an input (4.9 kΩ is beyond its low range: OL)', () => {
    const m = read(isolated(), 'continuity', 'drive.di1', 'drive.dcom')
    expect(m.shows).toBe('overRange')
    expect(m.tone).toBe(false)
  })

  it('stays silent with a probe lifted (open leads read OL)', () => {
    const m = read(isolated(), 'continuity', 'raisePb.a', null)
    expect(m.shows).toBe('overRange')
    expect(m.tone).toBe(false)
  })

  it('sounds just below 30 Ω and not just above it (a 100 Ω potentiometer set either side)', () => {
    const at = (position: number) =>
      start(
        raiseLowerSetup({
          devices: [{ id: 'pot', kind: 'potentiometer', label: 'Trim', ohms: 100, position }],
          wires: [],
          power: { on: false, locked: true },
        }),
      )
    // wiper to low end = 0.5 Ω end + 100 Ω × position
    expect(read(at(0.28), 'continuity', 'pot.wiper', 'pot.lo')).toMatchObject({ ohms: 28.5, tone: true })
    expect(read(at(0.3), 'continuity', 'pot.wiper', 'pot.lo')).toMatchObject({ ohms: 30.5, tone: false })
  })

  it('keeps the tone off on the resistance position, whatever it reads', () => {
    const s = run(isolated(), [{ t: isolated().t, type: 'device.pressed', device: 'raisePb' }])
    expect(read(s, 'resistance', 'raisePb.a', 'raisePb.b').tone).toBe(false)
  })
})

describe('resistance or continuity selected on a live circuit', () => {
  it('shows a voltage-present warning instead of a value across the live line, and flags it', () => {
    const m = read(live(), 'resistance', 'drive.l1', 'drive.l2')
    expect(m.shows).toBe('voltagePresent')
    expect(m.ohms).toBeNull()
    expect(m.liveResistanceTest).toBe(true)
  })

  it('warns across the charged bus after the display has gone dark', () => {
    const s = advance(run(start(), [{ t: 0, type: 'power.off' }]), 10_000)
    expect(readDrive(s).displayOn).toBe(false)
    const m = read(s, 'continuity', 'drive.dcp', 'drive.dcn')
    expect(m.shows).toBe('voltagePresent')
    expect(m.liveResistanceTest).toBe(true)
  })

  it('flags a live control circuit even with no voltage across the probes (a closed contact)', () => {
    const s = run(live(), [{ t: 0, type: 'device.pressed', device: 'raisePb' }])
    const m = read(s, 'continuity', 'raisePb.a', 'raisePb.b')
    expect(m.shows).toBe('ohms')
    expect(m.liveResistanceTest).toBe(true)
  })

  it('warns from 2 V across the probes (our threshold): the bus at ~15 V five minutes after switch-off, not at ~0.8 V after ten', () => {
    const off = run(start(), [{ t: 0, type: 'power.off' }])
    const five = advance(off, 5 * 60_000)
    const ten = advance(off, 10 * 60_000)
    expect(readDrive(five).busVolts).toBeGreaterThan(10)
    expect(read(five, 'resistance', 'drive.dcp', 'drive.dcn').shows).toBe('voltagePresent')
    expect(readDrive(ten).busVolts).toBeLessThan(2)
    expect(read(ten, 'resistance', 'drive.dcp', 'drive.dcn').shows).toBe('overRange')
  })

  it('warns on the proving unit (always live)', () => {
    expect(read(dead(), 'resistance', 'prover.pos', 'prover.neg').shows).toBe('voltagePresent')
  })

  it('does not flag a de-energised circuit, nor a voltage range on a live one', () => {
    expect(read(dead(), 'resistance', 'drive.di1', 'drive.dcom').liveResistanceTest).toBe(false)
    expect(read(live(), 'acVolts', 'drive.l1', 'drive.l2').liveResistanceTest).toBe(false)
  })
})

describe('probing a point that is not on the bench', () => {
  it('is refused with a message and leaves the probes where they were', () => {
    const s = run(live(), [{ t: 10, type: 'meter.probes', red: 'motor.z9', black: 'drive.pe' }])
    expect(s.meter.red).toBeNull()
    expect(s.messages[0].code).toBe('unknownPoint')
  })
})
