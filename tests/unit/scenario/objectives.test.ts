// Every objective kind, met and missed, judged on short attempts at the bench conveyor
// (raise/lower wired in sink logic and programmed, powered at the start).
import { describe, expect, it } from 'vitest'
import type { Objective } from '@shared/scenario'
import { isolateAndProve, restorePower } from './builders/procedures'
import { atSpeed, benchScenario, judge, ready, stopped } from './helpers'

const base = { id: 'o', title: 'objective under test', weight: 10 }
const objective = (o: Record<string, unknown>) => ({ ...base, ...o }) as Objective

describe('settingEquals', () => {
  const scenario = benchScenario([objective({ kind: 'settingEquals', key: 'stop.mode', value: 'coast' })])

  it('is met once the value is saved', () => {
    const result = judge(scenario, (b) => ready(b).set('stop.mode', 'coast').wait(500).save().wait(1000))
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(
      /^The setting "Stop method" is "Output off at once, motor coasts", active since 00:0\d\.\d/,
    )
  })

  it('is missed when the change was never saved, and says so', () => {
    const result = judge(scenario, (b) => ready(b).set('stop.mode', 'coast').wait(1000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/was never saved/)
  })
})

describe('settingInRange', () => {
  const scenario = benchScenario([
    objective({ kind: 'settingInRange', key: 'ramp.decelSeconds', min: 20, max: 40 }),
  ])

  it('is met by a saved value inside the range', () => {
    expect(judge(scenario, (b) => ready(b).configure({ 'ramp.decelSeconds': 30 })).met).toBe(true)
  })

  it('is missed by a saved value outside it', () => {
    const result = judge(scenario, (b) => ready(b).configure({ 'ramp.decelSeconds': 45 }))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/45 s at the end .*wanted 20 to 40 s\./)
  })
})

describe('wiringCondition', () => {
  const raiseOn = objective({
    kind: 'wiringCondition',
    while: { held: ['raiseButton'] },
    input: { function: 'raise' },
    expect: 'on',
  })

  it('is met when holding the button turns the input assigned to raise ON', () => {
    const result = judge(benchScenario([raiseOn]), (b) => ready(b).hold('raiseButton', 1000))
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/with Raise held, DI2, assigned to Raise speed, was ON at 2\d(\.\d)? V/)
  })

  it('judges electrically: the raise button on another input, assigned to raise there, also passes', () => {
    const scenario = benchScenario([raiseOn], (s) => {
      s.start.wires = s.start.wires.map((w) => (w.id === 'wRaiseOut' ? { ...w, to: 'drive.di5' } : w))
      s.start.settings['di2.function'] = 'none'
      s.start.settings['di5.function'] = 'raise'
    })
    const result = judge(scenario, (b) => ready(b).hold('raiseButton', 1000))
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/DI5, assigned to Raise speed, was ON/)
  })

  it('is missed when the digital-input common is not wired (no return path)', () => {
    const scenario = benchScenario([raiseOn], (s) => {
      s.start.wires = s.start.wires.filter((w) => w.id !== 'wCom')
    })
    const result = judge(scenario, (b) => ready(b).hold('raiseButton', 1000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/DI2, assigned to Raise speed, was OFF/)
  })

  it('is missed when the condition was never tried with the control supply on', () => {
    const result = judge(benchScenario([raiseOn]), (b) => ready(b).wait(2000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^Never tried with Raise held/)
  })

  it('reads an analog point against a voltage window', () => {
    const analog = objective({
      kind: 'wiringCondition',
      while: { positions: { runSwitch: 1 } },
      input: { point: 'drive.ai' },
      expect: { minVolts: -0.2, maxVolts: 0.2 },
    })
    // Nothing is wired to AI on the bench, so it reads ~0 V; with +24 V jumpered onto it, it does not.
    expect(judge(benchScenario([analog]), (b) => ready(b).switchTo('runSwitch', 1).wait(500)).met).toBe(true)
    const jumpered = benchScenario([analog], (s) => {
      s.start.wires.push({ id: 'wJumper', from: 'drive.p10', to: 'drive.ai', colour: 'blue' })
    })
    const missed = judge(jumpered, (b) => ready(b).switchTo('runSwitch', 1).wait(500))
    expect(missed.met).toBe(false)
    expect(missed.evidence).toMatch(/AI read 10 V/)
  })
})

describe('functionalCheck', () => {
  const raiseHolds = objective({
    kind: 'functionalCheck',
    device: 'raiseButton',
    effect: 'raises',
    thenHolds: true,
    holdSeconds: 3,
  })
  const run = (b: Parameters<typeof ready>[0]) =>
    ready(b).switchTo('runSwitch', 1).waitUntil(atSpeed, 'at speed').wait(1000)

  it('is met when raise raises the reference while running and releasing holds it', () => {
    const result = judge(benchScenario([raiseHolds]), (b) => run(b).hold('raiseButton', 3000).wait(4000))
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(
      /from 10 Hz to 16 Hz; after the release the reference stayed at 16 Hz for 3 s/,
    )
  })

  it('is missed when the raise button has the wrong contact type and the reference creeps', () => {
    const scenario = benchScenario([raiseHolds], (s) => {
      s.faults = [{ kind: 'wrongContactType', device: 'raiseButton' }]
    })
    const result = judge(scenario, (b) => run(b).hold('raiseButton', 3000).wait(4000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/did not rise|did not hold/)
  })

  it('is missed when the button was only pressed with the drive stopped', () => {
    const result = judge(benchScenario([raiseHolds]), (b) => ready(b).hold('raiseButton', 3000).wait(4000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/while the drive was not running/)
  })
})

describe('speedHeld', () => {
  const held = (unit: 'Hz' | 'rpm', target: number, tolerance: number, holdSeconds: number) =>
    objective({ kind: 'speedHeld', target, unit, tolerance, holdSeconds })
  const runAt = (b: Parameters<typeof ready>[0], holdMs: number) =>
    ready(b)
      .switchTo('runSwitch', 1)
      .waitUntil(atSpeed, 'at speed')
      .hold('raiseButton', 10_000) // 10 Hz + 2 Hz/s × 10 s = 30 Hz
      .waitUntil(atSpeed, 'at 30 Hz')
      .wait(holdMs)
      .switchTo('runSwitch', 0)
      .waitUntil(stopped, 'stopped')

  it('is met when the speed stays in the band long enough', () => {
    const result = judge(benchScenario([held('Hz', 30, 0.5, 5)]), (b) => runAt(b, 6000))
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/^Held within 29.5 Hz to 30.5 Hz from/)
  })

  it('is missed when the speed is held for too short a time, giving the longest stretch', () => {
    const result = judge(benchScenario([held('Hz', 30, 0.5, 5)]), (b) => runAt(b, 2000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^The longest time within 29.5 Hz to 30.5 Hz was 2\.\d s/)
  })

  it('works in rpm through the nameplate (4 poles, 50 Hz, 1440 rpm: 30 Hz is 864 rpm)', () => {
    // Slip fraction (1500 − 1440) / 1500 = 4 %; 120 · 30 / 4 × 0.96 = 864 rpm (handbook 120·f/p).
    expect(judge(benchScenario([held('rpm', 864, 5, 5)]), (b) => runAt(b, 6000)).met).toBe(true)
    const missed = judge(benchScenario([held('rpm', 1000, 5, 5)]), (b) => runAt(b, 6000))
    expect(missed.met).toBe(false)
    expect(missed.evidence).toMatch(/never came within 995 rpm to 1005 rpm; its highest speed was 864 rpm/)
  })
})

describe('stoppedBy', () => {
  const runThenStop = (b: Parameters<typeof ready>[0]) =>
    ready(b)
      .switchTo('runSwitch', 1)
      .waitUntil(atSpeed, 'at speed')
      .wait(1000)
      .switchTo('runSwitch', 0)
      .wait(15_000)

  it('is met by a ramp stop to standstill', () => {
    const result = judge(benchScenario([objective({ kind: 'stoppedBy', mode: 'ramp' })]), runThenStop)
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/began a ramp stop from 10 Hz and was at standstill by/)
  })

  it('is met by a coast stop when coast was asked for and chosen', () => {
    const scenario = benchScenario([objective({ kind: 'stoppedBy', mode: 'coast' })], (s) => {
      s.start.settings['stop.mode'] = 'coast'
    })
    expect(judge(scenario, runThenStop).met).toBe(true)
  })

  it('is missed by a coast stop when a ramp stop was asked for', () => {
    const scenario = benchScenario([objective({ kind: 'stoppedBy', mode: 'ramp' })], (s) => {
      s.start.settings['stop.mode'] = 'coast'
    })
    const result = judge(scenario, runThenStop)
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/stopped by a coast stop/)
  })

  it('is missed when the ramp stop ends in a bus overvoltage trip', () => {
    const scenario = benchScenario([objective({ kind: 'stoppedBy', mode: 'ramp' })], (s) => {
      s.start.machine = { coastSeconds: 60, minDecelSeconds: 30 }
    })
    const result = judge(scenario, runThenStop)
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/trip/i)
  })
})

describe('restartedWithRememberedReference', () => {
  const remembered = objective({ kind: 'restartedWithRememberedReference', minReferenceHz: 15 })
  const stopAndRestart = (b: Parameters<typeof ready>[0]) =>
    ready(b)
      .switchTo('runSwitch', 1)
      .waitUntil(atSpeed, 'at speed')
      .hold('raiseButton', 5000)
      .waitUntil(atSpeed, 'at 20 Hz')
      .switchTo('runSwitch', 0)
      .waitUntil(stopped, 'stopped')
      .wait(2000)
      .switchTo('runSwitch', 1)
      .wait(5000)

  it('is met when the drive restarts at the reference it had before the stop', () => {
    const result = judge(benchScenario([remembered]), stopAndRestart)
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/reference at 20 Hz; restarted at .* with 20 Hz/)
  })

  it('is missed when the reference returns to minimum at a stop', () => {
    const scenario = benchScenario([remembered], (s) => {
      s.start.settings['raiseLower.memoryAtStop'] = 'reset'
    })
    const result = judge(scenario, stopAndRestart)
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/restarted at .* with 10 Hz: the reference was not remembered/)
  })
})

describe('noWiringWhileEnergised', () => {
  const scenario = benchScenario([objective({ kind: 'noWiringWhileEnergised' })])

  it('is met when terminal work waits for the supply off and the bus below 50 V', () => {
    const result = judge(scenario, (b) => isolateAndProve(ready(b)).unwire('wLowerOut'))
    expect(result.met).toBe(true)
  })

  it('is missed by a wire added with the supply on', () => {
    const result = judge(scenario, (b) => ready(b).wire('wExtra', 'drive.p24', 'drive.di4'))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(
      /^Wire W8 added from \+24 to DI4 at 00:0\d\.\d while the supply disconnect was on\.$/,
    )
  })

  it('is missed by a wire added with the supply off but the DC bus still charged', () => {
    const result = judge(scenario, (b) =>
      ready(b).powerOff().wait(3000).lock().wire('wExtra', 'drive.p24', 'drive.di4'),
    )
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/while the DC bus was at \d{3} V\.$/)
  })
})

describe('lockBeforeWiring', () => {
  const scenario = benchScenario([objective({ kind: 'lockBeforeWiring' })])

  it('is met when every change is made under lock', () => {
    expect(judge(scenario, (b) => isolateAndProve(ready(b)).unwire('wLowerOut')).met).toBe(true)
  })

  it('is missed by a change with the disconnect off but unlocked', () => {
    const result = judge(scenario, (b) => isolateAndProve(ready(b), { lock: false }).unwire('wLowerOut'))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^Wire W7 removed at .* with no lock on the disconnect\.$/)
  })
})

describe('absenceOfVoltageProved', () => {
  const proved = objective({ kind: 'absenceOfVoltageProved', proveMeterBefore: true })

  it('is met by live-dead testing after the lock and before touching terminals', () => {
    const result = judge(benchScenario([proved]), (b) =>
      isolateAndProve(ready(b), { proveMeter: true }).unwire('wLowerOut'),
    )
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(
      /L1–L2 0 V, L2–L3 0 V, L1–L3 0 V, DC\+–DC− \d+(\.\d)? V; meter proved on 400 V/,
    )
  })

  it('is missed when the meter was not first proved on a known live source', () => {
    // Starting switched off and locked, the meter never sees a live source before the dead test.
    const scenario = benchScenario([proved], (s) => {
      s.start.power = { on: false, locked: true }
    })
    const result = judge(scenario, (b) => isolateAndProve(b).unwire('wLowerOut'))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/not checked on a known live source/)
  })

  it('is missed when a pair was never measured', () => {
    const scenario = benchScenario([objective({ kind: 'absenceOfVoltageProved' })])
    const result = judge(scenario, (b) => isolateAndProve(ready(b), { proveDead: false }).unwire('wLowerOut'))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/L1–L2 was not proved below 50 V .*it was never measured/)
  })
})

describe('isolated', () => {
  const scenario = benchScenario([objective({ kind: 'isolated', thresholdVolts: 50 })])

  it('is met when the attempt ends switched off, locked and discharged', () => {
    expect(judge(scenario, (b) => isolateAndProve(ready(b))).met).toBe(true)
  })

  it('is missed when the bus is still charged at the end', () => {
    const result = judge(scenario, (b) => ready(b).powerOff().wait(2000).lock().wait(1000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/DC bus was still at \d{3} V/)
  })
})

describe('noFaultTrips', () => {
  const trips = objective({ kind: 'noFaultTrips' })

  it('is met when the drive never trips', () => {
    expect(judge(benchScenario([trips]), (b) => ready(b).switchTo('runSwitch', 1).wait(5000)).met).toBe(true)
  })

  it('is missed when switching off while running trips the drive', () => {
    const result = judge(benchScenario([trips]), (b) =>
      ready(b).switchTo('runSwitch', 1).wait(5000).powerOff().wait(5000),
    )
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/^Tripped at 00:\d\d\.\d: /)
  })
})

describe('noAlarms', () => {
  const alarms = objective({ kind: 'noAlarms' })

  it('is met when no configuration alarm is left', () => {
    expect(judge(benchScenario([alarms]), (b) => ready(b).wait(1000)).met).toBe(true)
  })

  it('is missed while raise/lower inputs are assigned but the reference source is analog', () => {
    const scenario = benchScenario([alarms], (s) => {
      s.start.settings['reference.remoteSource'] = 'analog'
    })
    const result = judge(scenario, (b) => ready(b).wait(1000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/still showed: .*raise\/lower/i)
  })
})

describe('faultFoundAndCleared', () => {
  const scenario = benchScenario([objective({ kind: 'faultFoundAndCleared', fault: 0 })], (s) => {
    s.faults = [{ kind: 'contactWelded', device: 'lowerButton' }]
  })

  it('is met once a new contact block is fitted', () => {
    const result = judge(scenario, (b) =>
      isolateAndProve(ready(b)).fitContact('lowerButton', 'NO').wait(1000),
    )
    expect(result.met).toBe(true)
    expect(result.evidence).toMatch(/^The welded contact 13–14 on Lower was put right at/)
  })

  it('is missed while the fault is still there', () => {
    const result = judge(scenario, (b) => isolateAndProve(ready(b)).wait(1000))
    expect(result.met).toBe(false)
    expect(result.evidence).toMatch(/the welded contact 13–14 on Lower was still there/)
  })

  it('is missed when the replacement block is the wrong type again', () => {
    const result = judge(scenario, (b) =>
      isolateAndProve(ready(b)).fitContact('lowerButton', 'NC').wait(1000),
    )
    expect(result.met).toBe(false)
  })
})

describe('finishedWithin', () => {
  const scenario = benchScenario([objective({ kind: 'finishedWithin', minutes: 1 })])

  it('is met when the attempt ends inside the limit', () => {
    expect(judge(scenario, (b) => b.wait(59_000)).met).toBe(true)
  })

  it('is missed when it ends after the limit', () => {
    const result = judge(scenario, (b) => b.wait(61_000))
    expect(result.met).toBe(false)
    expect(result.evidence).toBe('Finished at 01:01.0; the limit was 01:00.0.')
  })
})

describe('with power restored', () => {
  it('judges the wiring as finally left, after rework under lockout', () => {
    const raiseOff = objective({
      kind: 'wiringCondition',
      while: { nothingHeld: true },
      input: { function: 'raise' },
      expect: 'off',
    })
    const scenario = benchScenario([raiseOff], (s) => {
      s.faults = [{ kind: 'wrongContactType', device: 'raiseButton' }]
    })
    const result = judge(scenario, (b) => {
      ready(b).wait(1000)
      isolateAndProve(b).fitContact('raiseButton', 'NO').wait(1000)
      restorePower(b).wait(1000)
    })
    expect(result.met).toBe(true)
  })
})
