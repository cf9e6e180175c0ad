// The grader names things as the panel shows them: wire markers, terminal numbers, settings and
// their values, input functions, objective kinds.
import { describe, expect, it } from 'vitest'
import { SAFETY_VIOLATION_KINDS } from '@shared/api'
import { createSimulation, INPUT_FUNCTIONS } from '@shared/model'
import {
  contactName,
  describeWork,
  deviceTerminalLabels,
  faultName,
  inputFunctionName,
  objectiveKindLabel,
  OBJECTIVE_KINDS,
  pairName,
  pointName,
  safetyViolationKindLabel,
  settingName,
  settingValueName,
  toSimulationSetup,
  wireName,
  wireNumber,
} from '@shared/scenario'
import type { Sample } from '@shared/scenario/samples'
import { shippedScenario } from './helpers'

const fan = createSimulation(toSimulationSetup(shippedScenario('dead-control-circuit')))
const startStop = createSimulation(toSimulationSetup(shippedScenario('three-wire-start-stop')))
const stirrer = createSimulation(toSimulationSetup(shippedScenario('potentiometer-reference')))

describe('names as the panel shows them', () => {
  it('numbers wires as their markers do: the digits of the id, else the place in the list', () => {
    expect(wireNumber('w4', 0)).toBe('W4')
    expect(wireNumber('w12', 3)).toBe('W12')
    expect(wireNumber('wRunOut', 2)).toBe('W3')
    // The fan station starts with wCom, wRunFeed, wRunOut fitted.
    expect(wireName('wRunOut', fan)).toBe('W3')
    expect(wireName('w7', fan)).toBe('W7')
    expect(wireName('wNew', fan, true)).toBe('W4')
    expect(wireName('wGone', fan)).toBeUndefined()
  })

  it('names terminals by their printed labels: drive strip, contact blocks (IEC 60947-5-1), potentiometer ends', () => {
    expect(pointName('drive.di1', fan)).toBe('DI1')
    expect(pointName('drive.p24', fan)).toBe('+24')
    expect(pointName('drive.dcn', fan)).toBe('DC−')
    expect(pointName('prover.pos', fan)).toBe('Prover +')
    expect(pointName('runSwitch.a', fan)).toBe('Fan run / stop terminal 13')
    expect(pointName('runSwitch.b', fan)).toBe('Fan run / stop terminal 14')
    expect(pointName('stopButton.a', startStop)).toBe('Stop terminal 11')
    expect(pointName('speedPot.wiper', stirrer)).toBe('Stirrer speed wiper (W)')
    expect(pointName('speedPot.hi', stirrer)).toBe('Stirrer speed high end (H)')
    expect(pointName('noSuch.a', fan)).toBe('a terminal the panel does not have')
    expect(pairName(['drive.l1', 'drive.l2'], fan)).toBe('L1–L2')
    expect(deviceTerminalLabels('pushbutton', 'NC')).toEqual({ a: '11', b: '12' })
    expect(deviceTerminalLabels('selector', 'NO')).toEqual({ a: '13', b: '14' })
  })

  it('names motor-cable work and faults by the drive output each conductor starts on, and the motor terminal', () => {
    const before = (event: Sample['event']) => ({ event, state: fan }) as Sample
    expect(
      describeWork(before({ t: 0, type: 'motor.conductorLanded', conductor: 'v', terminal: 'w1' })),
    ).toBe('Motor-cable conductor V landed on W1')
    expect(
      describeWork(before({ t: 0, type: 'motor.conductorLanded', conductor: 'u', terminal: null })),
    ).toBe('Motor-cable conductor U lifted')
    expect(describeWork(before({ t: 0, type: 'motor.cableReplaced' }))).toBe('Motor cable replaced')
    expect(faultName({ kind: 'motorConductorOpen', conductor: 'w' }, fan)).toBe(
      'the broken W conductor of the motor cable',
    )
  })

  it('names a device contact as its label shows it', () => {
    expect(contactName('runSwitch', fan)).toBe('Fan run / stop, contact 13–14')
    expect(contactName('stopButton', startStop)).toBe('Stop, contact 11–12')
  })

  it('names settings and values by the catalogue: labels, option labels, units', () => {
    expect(settingName('stop.mode')).toBe('"Stop method"')
    expect(settingValueName('stop.mode', 'coast')).toBe('"Output off at once, motor coasts"')
    expect(settingValueName('ramp.decelSeconds', 45)).toBe('45 s')
    expect(settingValueName('reference.remoteSource', 'raiseLower')).toBe('"Raise / lower inputs"')
    expect(settingValueName('stop.mode', 'sideways')).toBe('a value the drive does not offer')
    expect(settingName('no.such')).toBe('a setting the drive does not have')
  })

  it('names every input function, objective kind and violation kind in words', () => {
    const words = [
      ...INPUT_FUNCTIONS.map(inputFunctionName),
      ...OBJECTIVE_KINDS.map(objectiveKindLabel),
      ...SAFETY_VIOLATION_KINDS.map(safetyViolationKindLabel),
    ]
    for (const word of words) {
      expect(word).toMatch(/^[A-Z][a-z]/)
      expect(word).not.toMatch(/[a-z][A-Z]|[._$]/)
    }
    expect(new Set(OBJECTIVE_KINDS.map(objectiveKindLabel)).size).toBe(OBJECTIVE_KINDS.length)
    expect(objectiveKindLabel('wiringCondition')).toBe('Input wiring')
    expect(inputFunctionName('raise')).toBe('Raise speed')
  })
})
