// Live classroom grading: a fault an instructor puts in mid-attempt brings its own objectives, graded on
// method (put right under safe isolation, diagnosed after the injection, found by a telling measurement).
import { describe, expect, it } from 'vitest'
import { gradeResultSchema } from '@shared/api'
import type { AttemptEvent, InjectedFault } from '@shared/model'
import { createLiveGrader, grade, INJECTION_POINTS, toSimulationSetup } from '@shared/scenario'
import { LogBuilder } from './builders/logBuilder'
import { isolateAndProve, restorePower, running, standstill } from './builders/procedures'
import { shippedScenario } from './helpers'

const scenario = shippedScenario('reference-memory')
const by = { id: '00000000-0000-4000-8000-0000000000b1', name: 'Ottilie Marsh' }
const brokenRunWire: InjectedFault = { kind: 'brokenWire', wireId: 'wRunOut' }

function injection(
  fault: InjectedFault,
  n = 1,
): Omit<Extract<AttemptEvent, { type: 'fault.injected' }>, 't'> {
  return { type: 'fault.injected', injectionId: `00000000-0000-4000-8000-00000000010${n}`, fault, by }
}

/** The conveyor running, then the run wire broken by the instructor: the drive stops. */
function runningThenBroken(): LogBuilder {
  const b = new LogBuilder(toSimulationSetup(scenario))
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(2000)
  b.switchTo('runSwitch', 1)
    .waitUntil((d) => d.control !== 'stopped', 'starting')
    .wait(5000)
  b.record(injection(brokenRunWire)).waitUntil(standstill, 'the ramp stop after the wire broke').wait(2000)
  return b
}

type Repair = 'byMethod' | 'swapParts' | 'energised'

function repairRunWire(how: Repair): AttemptEvent[] {
  const b = runningThenBroken()
  if (how === 'byMethod') {
    // Across the run wire with the selector on: an open conductor reads the supply, a healthy one ~0 V.
    b.measure('runSwitch.b', 'drive.di1', 'dcVolts').wait(3000).probe(null, null).wait(1000)
    b.diagnose({ kind: 'wire', wire: 'wRunOut' }, 'open').wait(2000)
  }
  b.switchTo('runSwitch', 0).wait(1000)
  if (how === 'energised') {
    b.unwire('wRunOut').wait(3000).wire('wRunOutNew', 'runSwitch.b', 'drive.di1').wait(3000)
  } else {
    isolateAndProve(b)
    if (how === 'swapParts') {
      for (const [id, from, to] of [
        ['wRunFeed', 'drive.p24', 'runSwitch.a'],
        ['wRunOut', 'runSwitch.b', 'drive.di1'],
      ] as const)
        b.unwire(id).wait(3000).wire(`${id}2`, from, to).wait(3000)
    } else b.unwire('wRunOut').wait(3000).wire('wRunOutNew', 'runSwitch.b', 'drive.di1').wait(3000)
    restorePower(b)
  }
  b.switchTo('runSwitch', 1).waitUntil(running, 'running again').wait(3000)
  return b.end()
}

const injectedOf = (events: AttemptEvent[]) => grade(scenario, events).objectives.filter((o) => o.injection)

describe('grading a fault an instructor put in', () => {
  it('gives a repair by method every injected objective, naming the fault, who and when only in the evidence', () => {
    const result = grade(scenario, repairRunWire('byMethod'))
    const injected = result.objectives.filter((o) => o.injection)
    expect(injected.map((o) => [o.kind, o.met, o.pointsEarned])).toEqual([
      ['faultFoundAndCleared', true, INJECTION_POINTS.cleared],
      ['diagnosisCorrect', true, INJECTION_POINTS.diagnosis],
      ['discriminatingMeasurement', true, INJECTION_POINTS.measurement],
    ])
    for (const o of injected) {
      expect(o.title).toMatch(/^The fault your instructor put in: /)
      expect(o.title).not.toMatch(/wire|W3|fuse|contact|broken/i)
      expect(o.evidence).toMatch(/^Ottilie Marsh put in the broken wire W3 at \d\d:\d\d\.\d\./)
      expect(o.injection).toMatchObject({ index: 0, by: 'Ottilie Marsh' })
    }
    // The points count in the percentage: the scenario's own 100 plus the injection's 20.
    expect(result.points.possible).toBe(120)
    expect(result.points.passMark).toBe(84) // 70 of 100 → 84 of 120
    expect(gradeResultSchema.parse(result)).toEqual(result)
  })

  it('loses the method objectives when parts are swapped without a measurement or a diagnosis', () => {
    const injected = injectedOf(repairRunWire('swapParts'))
    expect(injected.map((o) => [o.kind, o.met])).toEqual([
      ['faultFoundAndCleared', true],
      ['diagnosisCorrect', false],
      ['discriminatingMeasurement', false],
    ])
    expect(injected[1]!.evidence).toMatch(/No diagnosis named wire W\d+: open circuit/)
  })

  it('does not count a repair made on an energised panel as put right', () => {
    const cleared = injectedOf(repairRunWire('energised'))[0]!
    expect(cleared.met).toBe(false)
    expect(cleared.evidence).toMatch(/not done under safe isolation/)
  })

  it('adds the objectives when the injection arrives in the live grader, and agrees with grade()', () => {
    const events = repairRunWire('byMethod')
    const at = events.findIndex((e) => e.type === 'fault.injected')
    const live = createLiveGrader(scenario)
    events.slice(0, at).forEach((e) => live.push(e))
    expect(live.result().objectives.some((o) => o.injection)).toBe(false)
    live.push(events[at]!)
    const now = live.result().objectives.filter((o) => o.injection)
    expect(now).toHaveLength(3)
    expect(now.every((o) => !o.met)).toBe(true)
    events.slice(at + 1).forEach((e) => live.push(e))
    expect(live.result()).toEqual(grade(scenario, events))
  })

  it('grades a log without injections exactly as before, messages and hints from the instructor included', () => {
    const b = new LogBuilder(toSimulationSetup(scenario))
    b.waitUntil((d) => d.power === 'ready', 'ready').wait(2000)
    b.switchTo('runSwitch', 1).waitUntil(running, 'running').wait(3000)
    const plain = [...b.events]
    b.record({
      type: 'message.received',
      messageId: '00000000-0000-4000-8000-0000000000c1',
      kind: 'hint',
      text: 'Look at what the drive shows for its inputs.',
      from: by,
    }).wait(1000)
    const withMessage = b.end()
    const before = grade(scenario, [...plain, { t: withMessage.at(-1)!.t, type: 'attempt.ended' }])
    const after = grade(scenario, withMessage)
    expect(after).toEqual(before)
    expect(after.hintsUsed).toEqual([])
    expect(after.points.possible).toBe(100)
  })

  it('gives no objectives to an injection that changed nothing (a part the bench no longer has)', () => {
    const b = new LogBuilder(toSimulationSetup(scenario))
    b.wait(1000)
      .record(injection({ kind: 'brokenWire', wireId: 'notFitted' }, 2))
      .wait(1000)
    expect(injectedOf(b.end())).toEqual([])
  })

  it('grades a setting changed behind their back on the diagnosis and the repair, with no measurement', () => {
    const b = new LogBuilder(toSimulationSetup(scenario))
    b.waitUntil((d) => d.power === 'ready', 'ready').wait(2000)
    b.record(injection({ kind: 'settingChanged', key: 'speed.max', value: 25 }, 3)).wait(2000)
    b.diagnose({ kind: 'setting', key: 'speed.max' }, 'wrongSetting').wait(2000)
    b.set('speed.max', 50).save().wait(2000)
    const injected = injectedOf(b.end())
    expect(injected.map((o) => [o.kind, o.met, o.pointsPossible])).toEqual([
      ['faultFoundAndCleared', true, INJECTION_POINTS.cleared],
      ['diagnosisCorrect', true, INJECTION_POINTS.diagnosis + INJECTION_POINTS.measurement],
    ])
  })

  it('does not hold later unrelated work against a setting already saved back', () => {
    const b = new LogBuilder(toSimulationSetup(scenario))
    b.waitUntil((d) => d.power === 'ready', 'ready').wait(2000)
    b.record(injection({ kind: 'settingChanged', key: 'stop.mode', value: 'coast' }, 5)).wait(2000)
    b.set('stop.mode', 'ramp').save().wait(2000)
    // Later, a wire taken off with the supply on: a safety violation of the attempt, not of this repair.
    b.unwire('wLowerOut').wait(2000)
    const result = grade(scenario, b.end())
    expect(result.safetyViolations.length).toBeGreaterThan(0)
    expect(result.objectives.find((o) => o.injection && o.kind === 'faultFoundAndCleared')?.met).toBe(true)
  })

  it('finds a dead input by the voltage on its terminal while the drive shows it OFF', () => {
    const b = new LogBuilder(toSimulationSetup(scenario))
    b.waitUntil((d) => d.power === 'ready', 'ready').wait(2000)
    b.record(injection({ kind: 'inputUnresponsive', input: 1 }, 4)).wait(1000)
    b.switchTo('runSwitch', 1).wait(3000)
    b.measure('drive.di1', 'drive.dcom', 'dcVolts').wait(3000).probe(null, null).wait(1000)
    b.diagnose({ kind: 'terminal', point: 'drive.di1' }, 'notResponding').wait(2000)
    b.switchTo('runSwitch', 0).wait(1000)
    isolateAndProve(b)
    b.unwire('wRunOut').wait(3000).wire('wRunOut4', 'runSwitch.b', 'drive.di4').wait(3000)
    restorePower(b)
    b.configure({ 'di1.function': 'none', 'di4.function': 'run' }).wait(2000)
    b.switchTo('runSwitch', 1).waitUntil(running, 'running on DI4').wait(3000)
    const injected = injectedOf(b.end())
    expect(injected.map((o) => [o.kind, o.met])).toEqual([
      ['faultFoundAndCleared', true],
      ['diagnosisCorrect', true],
      ['discriminatingMeasurement', true],
    ])
    expect(injected[2]!.evidence).toMatch(/enough to switch the input ON, while the drive showed DI1 OFF/)
  })
})
