// Motor nameplates: every scenario's motor is complete and self-consistent, and the checks catch a plate
// whose figures disagree.
import { readdirSync, readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { unit } from 'mathjs'
import { describe, expect, it } from 'vitest'
import {
  nameplatePoles,
  nameplateProblems,
  ratedWatts,
  synchronousRpm,
  TRADE_VOLTAGES,
  wattsFromElectricalFigures,
  WATTS_PER_HP,
  type MotorNameplate,
} from '../../../shared/model/index'
import { checkScenario, type Scenario } from '../../../shared/scenario'

const dir = resolve(import.meta.dirname, '../../../scenarios')
const scenarios: Scenario[] = readdirSync(dir)
  .filter((f) => f.endsWith('.json'))
  .sort()
  .map((f) => {
    const result = checkScenario(JSON.parse(readFileSync(resolve(dir, f), 'utf8')))
    if (!result.ok) throw new Error(`${f}: ${JSON.stringify(result.problems)}`)
    return result.scenario
  })
const plates = scenarios.map((s) => [s.id, s.start.motor!, s] as const)

describe('every scenario motor nameplate', () => {
  it('is present on every shipped scenario', () => {
    expect(scenarios.length).toBeGreaterThan(0)
    for (const s of scenarios) expect(s.start.motor, s.id).toBeDefined()
  })

  it('has its own serial', () => {
    const serials = plates.map(([, np]) => np.serial)
    expect(new Set(serials).size).toBe(serials.length)
  })

  // Three-phase motor output P = 1.732 × V × I × PF × EFF: the electric-motor formula table of the Contractors
  // Unlimited technical toolbox (electric-motors page); the same relation is in the US DOE motor systems
  // sourcebook (from memory).
  it.each(plates)(
    '%s: P = √3·V·I·cos φ·η agrees with the rated output within 5 % (three-phase motor formula table)',
    (_id, np) => {
      const watts =
        Math.sqrt(3) * np.ratedVolts * np.fullLoadAmps * np.powerFactor * (np.efficiencyPercent / 100)
      expect(Math.abs(watts / ratedWatts(np) - 1)).toBeLessThanOrEqual(0.05)
      expect(wattsFromElectricalFigures(np)).toBeCloseTo(watts, 9)
    },
  )

  // Shaft speed 120 × F ÷ poles (same formula table; REFERENCES.md "Motor and ramps").
  it.each(plates)('%s: rated speed is below synchronous speed n = 120·f/p, slip under 8 %', (_id, np) => {
    const ns = synchronousRpm(np.ratedHz, nameplatePoles(np))
    expect(np.ratedRpm).toBeLessThan(ns)
    expect((ns - np.ratedRpm) / ns).toBeLessThan(0.08)
  })

  it.each(plates)(
    '%s: voltage and frequency are a usual trade pair (400 V 50 Hz, 460 V 60 Hz …)',
    (_id, np) => {
      expect(TRADE_VOLTAGES[np.ratedHz]).toContain(np.ratedVolts)
      expect(nameplateProblems(np)).toEqual([])
    },
  )

  it.each(plates)(
    '%s: the drive is programmed with the plate and fed at its voltage',
    (_id, np, scenario) => {
      const s = scenario.start.settings
      expect(s['motor.ratedVoltage']).toBe(np.ratedVolts)
      expect(s['motor.ratedFrequency']).toBe(np.ratedHz)
      expect(s['motor.ratedSpeed']).toBe(np.ratedRpm)
      expect(s['motor.ratedCurrent']).toBe(np.fullLoadAmps)
      expect(s['motor.poles']).toBe(nameplatePoles(np))
      expect(scenario.start.lineVolts ?? 400).toBe(np.ratedVolts)
    },
  )

  it.each(plates)('%s: the machine says what kind of load it is', (_id, _np, scenario) => {
    expect(['variableTorque', 'constantTorque']).toContain(scenario.start.machine?.loadKind)
  })
})

describe('the nameplate checks', () => {
  const good: MotorNameplate = {
    serial: 'T-1',
    ratedVolts: 400,
    ratedHz: 50,
    ratedPower: 5.5,
    powerUnit: 'kW',
    fullLoadAmps: 10.7,
    powerFactor: 0.83,
    efficiencyPercent: 89.6,
    connection: 'delta',
    ratedRpm: 1460,
    duty: 'S1',
  }

  it('accepts a consistent plate', () => {
    expect(nameplateProblems(good)).toEqual([])
  })

  it('refuses 400 V at 60 Hz, an unusual pairing', () => {
    expect(nameplateProblems({ ...good, ratedHz: 60, ratedRpm: 1750 }).map((p) => p.field)).toContain(
      'ratedVolts',
    )
  })

  it('refuses a current that does not match the power', () => {
    expect(nameplateProblems({ ...good, fullLoadAmps: 20 }).map((p) => p.field)).toEqual(['fullLoadAmps'])
  })

  it('refuses a rated speed at or above synchronous speed', () => {
    expect(nameplateProblems({ ...good, ratedRpm: 1500 }).map((p) => p.field)).toContain('ratedRpm')
  })

  it('converts horsepower as a units library does: 1 hp = 745.7 W (NIST SP 811; mathjs units)', () => {
    expect(WATTS_PER_HP).toBeCloseTo(unit(1, 'hp').toNumber('W'), 6)
    expect(ratedWatts({ ...good, ratedPower: 5, powerUnit: 'hp' })).toBeCloseTo(
      unit(5, 'hp').toNumber('W'),
      6,
    )
  })

  it('finds the poles from rated speed and frequency (n = 120·f/p: 1460 rpm at 50 Hz → 4, 2900 → 2, 970 → 6)', () => {
    expect(nameplatePoles({ ratedHz: 50, ratedRpm: 1460 })).toBe(4)
    expect(nameplatePoles({ ratedHz: 50, ratedRpm: 2900 })).toBe(2)
    expect(nameplatePoles({ ratedHz: 50, ratedRpm: 970 })).toBe(6)
    expect(nameplatePoles({ ratedHz: 60, ratedRpm: 1750 })).toBe(4)
  })
})
