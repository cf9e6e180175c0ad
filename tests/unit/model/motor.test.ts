// Motor nameplate arithmetic against handbook worked examples (REFERENCES.md "Motor and ramps").
import { evaluate, type Unit } from 'mathjs'
import { describe, expect, it } from 'vitest'
import { frequencyForRpm, shaftRpm, slipFraction, synchronousRpm } from '../../../shared/model/index'

describe('synchronous speed n = 120·f/p', () => {
  it.each([
    // Electrical engineering handbooks: 60 Hz — 2 poles 3600, 4 poles 1800, 6 poles 1200 rpm; 50 Hz 4 poles 1500.
    [60, 4, 1800],
    [50, 4, 1500],
    [60, 2, 3600],
    [60, 6, 1200],
  ])('gives %d Hz with %d poles → %d rpm', (f, p, rpm) => {
    expect(synchronousRpm(f, p)).toBe(rpm)
  })

  it('matches a units library: f / pole pairs, converted from rev/s to rpm (mathjs units)', () => {
    const revolutions = evaluate('60 Hz / 2') as Unit // 4 poles = 2 pole pairs: revolutions per second
    expect(synchronousRpm(60, 4)).toBeCloseTo(revolutions.toNumber('min^-1'), 9)
  })
})

describe('slip and shaft speed', () => {
  it('computes 2.78 % slip for 1750 rpm on an 1800 rpm motor (handbook example)', () => {
    expect(slipFraction(60, 4, 1750) * 100).toBeCloseTo(2.78, 2)
  })

  it('shows rated speed at rated frequency', () => {
    expect(shaftRpm(50, 4, 50, 1460)).toBeCloseTo(1460, 9)
  })

  it('scales the shaft speed with frequency (constant slip fraction, common practice)', () => {
    expect(shaftRpm(25, 4, 50, 1460)).toBeCloseTo(730, 9)
  })

  it('finds the output frequency for a shaft speed (inverse)', () => {
    expect(frequencyForRpm(1460, 4, 50, 1460)).toBeCloseTo(50, 9)
    expect(frequencyForRpm(shaftRpm(37.3, 6, 60, 1170), 6, 60, 1170)).toBeCloseTo(37.3, 9)
  })
})
