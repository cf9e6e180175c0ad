// Troubleshooting graded on method: diagnosisCorrect, discriminatingMeasurement and
// noNeedlessReplacements, met and missed, on the bench conveyor with a wrong contact block on RAISE
// (closed at rest where its label says normally open).
import { describe, expect, it } from 'vitest'
import { createSimulation, readMeter, type MeterReading } from '@shared/model'
import {
  checkScenario,
  grade,
  methodProblems,
  readingsDiffer,
  tellingReading,
  toSimulationSetup,
  type Objective,
} from '@shared/scenario'
import { isolateAndProve } from './builders/procedures'
import { benchScenario, builderFor, judge, ready, shippedScenario } from './helpers'

const base = { id: 'o', title: 'objective under test', weight: 10 }
const objective = (o: Record<string, unknown>) => ({ ...base, ...o }) as Objective
const wrongRaiseBlock = (objectives: Objective[]) =>
  benchScenario(objectives, (s) => {
    s.faults = [{ kind: 'wrongContactType', device: 'raiseButton' }]
  })

describe('diagnosisCorrect', () => {
  const scenario = wrongRaiseBlock([objective({ kind: 'diagnosisCorrect', fault: 0 })])

  it('is met by the right part and finding recorded before the repair, and names them', () => {
    const result = judge(scenario, (b) => {
      ready(b).diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(1000)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(
      /^Diagnosed Raise: wrong contact type at 00:01\.0, before the repair at \d\d:\d\d\.\d\.$/,
    )
  })

  it('is not met before the repair, even when right (a live tick must not confirm a guess)', () => {
    const result = judge(scenario, (b) =>
      ready(b).diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(1000),
    )
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^Not judged: it was not put right by the end/)
  })

  it('is missed when the diagnosis comes only after the repair', () => {
    const result = judge(scenario, (b) => {
      isolateAndProve(ready(b)).fitContact('raiseButton', 'NO').wait(1000)
      b.diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(1000)
    })
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^No diagnosis named Raise: wrong contact type before the repair at/)
  })

  it('is missed when the right part is named with the wrong finding last', () => {
    const result = judge(scenario, (b) => {
      ready(b).diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(500)
      b.diagnose({ kind: 'device', device: 'raiseButton' }, 'open').wait(500)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(
      /was Raise: open circuit at 00:01\.5; what was wrong was Raise: wrong contact type\./,
    )
  })

  it('is missed when healthy parts were named as well (naming every part in turn does not pass)', () => {
    const result = judge(scenario, (b) => {
      ready(b).diagnose({ kind: 'controlFuse' }, 'blown').wait(500)
      b.diagnose({ kind: 'device', device: 'raiseButton' }, 'wrongContactType').wait(500)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(
      /also named a part with nothing wrong: the control fuse: blown at 00:01\.0\./,
    )
  })

  it('judges a problem built into the start by the first work on that part (a setting saved)', () => {
    const setting = benchScenario(
      [
        objective({
          kind: 'diagnosisCorrect',
          expect: { target: { kind: 'setting', key: 'stop.mode' }, findings: ['wrongSetting'] },
        }),
      ],
      (s) => {
        s.start.settings['stop.mode'] = 'coast'
      },
    )
    const right = judge(setting, (b) =>
      ready(b)
        .diagnose({ kind: 'setting', key: 'stop.mode' }, 'wrongSetting')
        .wait(500)
        .configure({ 'stop.mode': 'ramp' }),
    )
    expect(right.met).toBe(true)
    expect(right.evidence).toMatch(
      /^Diagnosed the setting "Stop method": set wrong at 00:01\.0, before the repair at/,
    )
    const late = judge(setting, (b) =>
      ready(b)
        .configure({ 'stop.mode': 'ramp' })
        .wait(500)
        .diagnose({ kind: 'setting', key: 'stop.mode' }, 'wrongSetting'),
    )
    expect(late.met).toBe(false)
  })

  it('is refused by checkScenario with both a fault and an expected answer, or neither', () => {
    const scenario = structuredClone(wrongRaiseBlock([objective({ kind: 'diagnosisCorrect', fault: 0 })]))
    const o = scenario.objectives[0] as Objective & { expect?: unknown; fault?: number }
    o.expect = { target: { kind: 'controlFuse' }, findings: ['blown'] }
    const result = checkScenario(scenario)
    expect(result.ok).toBe(false)
    if (!result.ok) expect(result.problems[0]!.message).toMatch(/either fault .* or expect/)
  })
})

describe('discriminatingMeasurement', () => {
  const scenario = wrongRaiseBlock([objective({ kind: 'discriminatingMeasurement', fault: 0 })])

  it('is met by a reading across the released button: ~0 V where a healthy open contact reads the supply', () => {
    const result = judge(scenario, (b) => {
      ready(b).measure('raiseButton.a', 'raiseButton.b', 'dcVolts').wait(1000).probe(null, null).wait(500)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(
      /^At 00:01\.0 the meter on Raise terminal 13 \(red\) and Raise terminal 14 \(black\) read 0(\.0)? V on V DC; a healthy circuit would read 2\d(\.\d)? V on V DC\.$/,
    )
  })

  it('is met dead too: resistance across the released contact, near 0 Ω against over-range', () => {
    const result = judge(scenario, (b) => {
      isolateAndProve(ready(b))
      b.measure('raiseButton.a', 'raiseButton.b', 'resistance').wait(1000)
      b.fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/Ω on Resistance \(Ω\); a healthy circuit would read over-range/)
  })

  it('is missed by readings that a healthy circuit would show alike (the supply, the DC bus)', () => {
    const result = judge(scenario, (b) => {
      ready(b).measure('drive.p24', 'drive.0v', 'dcVolts').wait(1000)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
    })
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(
      /^No meter reading before the repair at \d\d:\d\d\.\d told this fault apart/,
    )
  })

  it('is not met while the fault is still there (a live tick must not point at the fault)', () => {
    const result = judge(scenario, (b) =>
      ready(b).measure('raiseButton.a', 'raiseButton.b', 'dcVolts').wait(1000),
    )
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^Not judged: the fault was not put right by the end/)
  })

  it('is missed when the telling reading is taken only after the repair', () => {
    const result = judge(scenario, (b) => {
      isolateAndProve(ready(b)).fitContact('raiseButton', 'NO').wait(1000)
      b.measure('raiseButton.a', 'raiseButton.b', 'resistance').wait(1000)
    })
    expect(result.met).toBe(false)
  })
})

describe('readingsDiffer (the rule: more than 2 V, another kind of display, or ohms by more than ×2 and 1 Ω)', () => {
  const volts = (v: number): MeterReading => ({
    red: 'drive.p24',
    black: 'drive.0v',
    mode: 'dcVolts',
    shows: 'volts',
    volts: v,
    ohms: null,
    tone: false,
    floating: false,
    liveResistanceTest: false,
  })
  const ohms = (o: number | null): MeterReading => ({
    ...volts(0),
    mode: 'resistance',
    shows: o === null ? 'overRange' : 'ohms',
    volts: null,
    ohms: o,
  })
  it.each([
    [volts(24), volts(0), true],
    [volts(24), volts(22.5), false],
    [volts(24), volts(21.9), true],
    [ohms(0.2), ohms(null), true],
    [ohms(0.2), ohms(0.9), false],
    [ohms(4700), ohms(6000), false],
    [ohms(4700), ohms(12000), true],
    [volts(0), ohms(0), true],
  ])('%#', (a, b, differ) => {
    expect(readingsDiffer(a, b)).toBe(differ)
    expect(readingsDiffer(b, a)).toBe(differ)
  })

  it('finds a blown control fuse by +24 to 0V and not by the DC bus (the model read both ways)', () => {
    const scenario = shippedScenario('dead-control-circuit')
    const state = createSimulation(toSimulationSetup(scenario))
    const fuse = scenario.faults[0]!
    const onSupply = { ...state, meter: { red: 'drive.p24', black: 'drive.0v', mode: 'dcVolts' as const } }
    expect(readMeter(onSupply).volts).toBe(0)
    expect(tellingReading(onSupply, fuse)?.healthy.volts).toBeGreaterThan(20)
    const onBus = { ...state, meter: { red: 'drive.dcp', black: 'drive.dcn', mode: 'dcVolts' as const } }
    expect(tellingReading(onBus, fuse)).toBeUndefined()
  })
})

describe('noNeedlessReplacements', () => {
  const scenario = wrongRaiseBlock([objective({ kind: 'noNeedlessReplacements', costEach: 4 })])

  it('is met when only the faulty part is replaced', () => {
    const result = judge(scenario, (b) =>
      isolateAndProve(ready(b)).fitContact('raiseButton', 'NO').wait(1000),
    )
    expect(result.met).toBe(true)
    expect(result.pointsEarned).toBe(10)
  })

  it('costs points for each healthy part replaced and names each one', () => {
    const b = builderFor(scenario)
    isolateAndProve(ready(b))
    b.record({ type: 'fuse.replaced' }).wait(1000)
    b.fitContact('lowerButton', 'NO').wait(1000).fitContact('raiseButton', 'NO').wait(1000)
    b.unwire('wRunOut').wait(1000).wire('wRunOut2', 'runSwitch.b', 'drive.di1').wait(1000)
    b.unwire('wLowerOut').wait(1000) // taken off, not made again: a wiring change, not a replacement
    const result = grade(scenario, b.end()).objectives[0]!
    expect(result.met).toBe(false)
    expect(result.pointsEarned).toBe(0) // 3 × 4 = 12 > 10: never below zero
    expect(result.evidence).toMatch(
      /^3 healthy parts replaced \(10 points lost\): the control fuse at \d\d:\d\d\.\d, which was not blown; the contact block of Lower at .*, which was right; wire W\d, taken off at .* and made again at .* although it was not broken\.$/,
    )
  })

  it('costs only costEach for one healthy part', () => {
    const b = builderFor(scenario)
    isolateAndProve(ready(b)).fitContact('lowerButton', 'NO').wait(1000)
    const result = grade(scenario, b.end())
    expect(result.objectives[0]!.pointsEarned).toBe(6)
    expect(result.points.earned).toBe(6)
    expect(result.score).toBe(60)
  })
})

describe('scenario rules for troubleshooting', () => {
  it('refuses an objective title that names the injected fault', () => {
    const scenario = structuredClone(shippedScenario('dead-control-circuit'))
    scenario.objectives.find((o) => o.id === 'supply-restored')!.title = 'The blown control fuse replaced'
    const result = checkScenario(scenario)
    expect(result.ok).toBe(false)
    if (!result.ok) expect(result.problems[0]!.message).toMatch(/names the fault \("blown"\)/)
  })

  it('asks every shipped troubleshooting scenario for a diagnosis and a telling measurement per fault', () => {
    expect(methodProblems(shippedScenario('dead-control-circuit'))).toEqual([])
    const scenario = structuredClone(shippedScenario('dead-control-circuit'))
    scenario.objectives = scenario.objectives.filter((o) => o.id !== 'run-measured' && o.id !== 'no-needless')
    expect(methodProblems(scenario).map((p) => `${p.path}: ${p.message}`)).toEqual([
      '$.faults[1]: No objective of the kind “Measured before repairing” judges this fault',
      '$.objectives: A troubleshooting scenario needs an objective of the kind “No needless replacements”',
    ])
  })
})
