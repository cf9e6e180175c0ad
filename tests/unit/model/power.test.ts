// The DC bus and the supply disconnect: charging, the stored charge after switching off, and what
// the meter reads on the power terminals (proving absence of voltage).
import { evaluate } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { advance, readCircuit, readDrive, type SimState } from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

const off = () => start(raiseLowerSetup({ power: { on: false, locked: false } }))
const bus = (s: SimState) => readDrive(s).busVolts
const meter = (s: SimState, red: string, black: string) =>
  readCircuit(run(s, [{ t: s.t, type: 'meter.probes', red, black }])).meter

describe('DC bus', () => {
  it('charges to the six-pulse average 3·√2/π × 400 V ≈ 540 V (rectifier textbook formula)', () => {
    const nominal = evaluate('3 * sqrt(2) / pi * 400') as number
    const s = advance(run(off(), [{ t: 0, type: 'power.on' }]), 5000)
    expect(bus(s)).toBeCloseTo(nominal, 4)
    expect(readDrive(s).power).toBe('ready')
  })

  it('charges linearly in 1.5 s and wakes the electronics on the way', () => {
    const s = run(off(), [{ t: 0, type: 'power.on' }])
    expect(readDrive(s).displayOn).toBe(false)
    expect(readDrive(advance(s, 750)).power).toBe('charging')
    expect(bus(advance(s, 750))).toBeCloseTo(bus(advance(s, 1500)) / 2, 4)
    expect(readDrive(advance(s, 1000)).displayOn).toBe(true)
  })

  it('is still dangerous after the display has gone dark (the key teaching point)', () => {
    const s = run(start(), [{ t: 0, type: 'power.off' }])
    const dark = advance(s, 5000)
    expect(readDrive(dark).displayOn).toBe(false)
    expect(readDrive(dark).power).toBe('off')
    expect(bus(dark)).toBeGreaterThan(250)
    expect(readDrive(dark).busHazard).toBe(true)
  })

  it('takes minutes, not seconds, to fall below 50 V (NEC 460.6 asks 1 min, IEC 60204-1 6.2.4 warns past 5 s)', () => {
    const s = run(start(), [{ t: 0, type: 'power.off' }])
    expect(bus(advance(s, 60_000))).toBeGreaterThan(50) // longer than NEC 460.6's 1 min: hence the warning label
    expect(bus(advance(s, 5 * 60_000))).toBeLessThan(50) // "wait 5 minutes" as labels commonly say (common practice)
  })

  it('decays exponentially in closed form (a constant ratio over equal intervals)', () => {
    const dark = advance(run(start(), [{ t: 0, type: 'power.off' }]), 10_000)
    const r1 = bus(advance(dark, 20_000)) / bus(dark)
    const r2 = bus(advance(dark, 40_000)) / bus(advance(dark, 20_000))
    expect(r1).toBeCloseTo(r2, 6) // readings are rounded to the microvolt
  })
})

describe('the meter on the power terminals', () => {
  it('reads the line voltage (AC) between two line terminals with the disconnect on', () => {
    const m = meter(start(), 'drive.l1', 'drive.l2')
    expect(m.mode).toBe('AC')
    expect(m.volts!).toBeCloseTo(400, 6)
  })

  it('reads line-to-earth 400/√3 ≈ 231 V from a line terminal to PE', () => {
    expect(meter(start(), 'drive.l3', 'drive.pe').volts!).toBeCloseTo(400 / Math.sqrt(3), 4)
  })

  it('reads the bus (DC) between DC+ and DC−', () => {
    const m = meter(start(), 'drive.dcp', 'drive.dcn')
    expect(m.mode).toBe('DC')
    expect(m.volts!).toBeCloseTo(bus(start()), 4)
  })

  it('reads 0 V on the line terminals once the disconnect is off, while the bus is still charged', () => {
    const s = advance(run(start(), [{ t: 0, type: 'power.off' }]), 10_000)
    expect(meter(s, 'drive.l1', 'drive.l2').volts).toBe(0)
    expect(meter(s, 'drive.dcp', 'drive.dcn').volts!).toBeGreaterThan(200)
  })

  it('reads about 0 V on the bus after the discharge time', () => {
    const s = advance(run(start(), [{ t: 0, type: 'power.off' }]), 30 * 60_000)
    expect(meter(s, 'drive.dcp', 'drive.dcn').volts!).toBeLessThan(1)
  })

  it('reads nothing between the isolated control circuit and a power terminal', () => {
    const m = meter(start(), 'drive.p24', 'drive.l1')
    expect(m.floating).toBe(true)
    expect(m.volts).toBe(0)
  })
})

describe('the meter proving unit (live–dead–live, NFPA 70E 120.5(7))', () => {
  it('is live with the drive isolated and discharged, so the meter can be proved after the dead test', () => {
    const dead = advance(run(start(), [{ t: 0, type: 'power.off' }]), 30 * 60_000)
    expect(meter(dead, 'drive.dcp', 'drive.dcn').volts!).toBeLessThan(1)
    expect(meter(dead, 'prover.pos', 'prover.neg').volts).toBe(110)
  })

  it('reads nothing between the proving unit and the drive', () => {
    expect(meter(start(), 'prover.pos', 'drive.l1').floating).toBe(true)
  })
})

describe('disconnect and lockout', () => {
  it('refuses to switch on while locked, and says why', () => {
    const s = run(off(), [
      { t: 0, type: 'lock.applied' },
      { t: 10, type: 'power.on' },
    ])
    expect(readDrive(s).lineOn).toBe(false)
    expect(readDrive(s).messages[0].code).toBe('powerOnLocked')
  })

  it('refuses to lock a disconnect that is on', () => {
    const s = run(start(), [{ t: 0, type: 'lock.applied' }])
    expect(readDrive(s).locked).toBe(false)
    expect(readDrive(s).messages[0].code).toBe('lockNeedsPowerOff')
  })

  it('switches on again once the lock is removed', () => {
    const s = run(off(), [
      { t: 0, type: 'lock.applied' },
      { t: 10, type: 'lock.removed' },
      { t: 20, type: 'power.on' },
    ])
    expect(readDrive(s).lineOn).toBe(true)
  })
})
