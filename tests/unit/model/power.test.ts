// The DC bus and the supply disconnect: charging, the stored charge after switching off, lockout.
// What the meter reads on the power terminals is in meter.test.ts.
import { evaluate } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { advance, readDrive, type SimState } from '../../../shared/model/index'
import { raiseLowerSetup, run, start } from './fixtures'

const off = () => start(raiseLowerSetup({ power: { on: false, locked: false } }))
const bus = (s: SimState) => readDrive(s).busVolts

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
