// wiringCondition: judged electrically from the model's circuit solution, never from terminal names.
// The verdict comes from the last moment the condition held with the control supply on, so the
// wiring as finally left is what counts.
import type { InputReading, SimState } from '../../model'
import { formatTime, formatVolts } from '../format'
import { deviceName, inputFunctionName, pointName } from '../names'
import type { DeviceCondition, InputSelector, ObjectiveOf } from '../objectiveSchema'
import { sameCircuitButMeter, type Sample } from '../samples'
import { folding, type Evaluator } from './types'

const POSITION_TOLERANCE = 1e-3

/**
 * A test of the condition on a state, made once per objective (it runs on every sample). It reads
 * only the devices, which most events leave as they were: the answer for the last devices is kept.
 */
function conditionTest(condition: DeviceCondition): (state: SimState) => boolean {
  const held = condition.held ?? []
  const released = condition.released ?? []
  const positions = Object.entries(condition.positions ?? {})
  const test = ({ devices, deviceOrder }: SimState): boolean => {
    for (const id of held) if (!devices[id]?.pressed) return false
    for (const id of released) if (devices[id]?.pressed ?? true) return false
    for (const [id, position] of positions) {
      const d = devices[id]
      if (!d || Math.abs(d.position - position) > POSITION_TOLERANCE) return false
    }
    if (condition.nothingHeld) {
      for (const id of deviceOrder) {
        if (devices[id]!.spec.kind === 'pushbutton' && devices[id]!.pressed) return false
      }
    }
    return true
  }
  let lastDevices: SimState['devices'] | undefined
  let lastOrder: SimState['deviceOrder'] | undefined
  let lastAnswer = false
  return (state) => {
    if (state.devices !== lastDevices || state.deviceOrder !== lastOrder) {
      lastDevices = state.devices
      lastOrder = state.deviceOrder
      lastAnswer = test(state)
    }
    return lastAnswer
  }
}

export function describeCondition(condition: DeviceCondition, state: SimState): string {
  const label = (id: string) => deviceName(id, state)
  const parts: string[] = []
  for (const id of condition.held ?? []) parts.push(`${label(id)} held`)
  for (const id of condition.released ?? []) parts.push(`${label(id)} released`)
  for (const [id, position] of Object.entries(condition.positions ?? {})) {
    const kind = state.devices[id]?.spec.kind
    parts.push(
      kind === 'potentiometer'
        ? `${label(id)} at ${Math.round(position * 100)} %`
        : `${label(id)} in position ${position}`,
    )
  }
  if (condition.nothingHeld) parts.push('nothing pressed')
  return parts.join(', ')
}

function selectorName(selector: InputSelector, state: SimState): string {
  return 'function' in selector
    ? `the input assigned to ${inputFunctionName(selector.function)}`
    : pointName(selector.point, state)
}

interface Judgement {
  ok: boolean
  text: string
}

function judgeMoment(objective: ObjectiveOf<'wiringCondition'>, sample: Sample): Judgement {
  const circuit = sample.circuit
  const { expect, input } = objective
  if ('function' in input) {
    const assigned = circuit.inputs.filter((i) => i.function === input.function)
    if (assigned.length === 0) {
      return { ok: false, text: `no input was assigned to ${inputFunctionName(input.function)}` }
    }
    const describe = (i: InputReading) =>
      `DI${i.input}, assigned to ${inputFunctionName(i.function)}, was ${i.on ? 'ON' : 'OFF'} at ${formatVolts(i.volts)}`
    if (typeof expect === 'string') {
      const ok = assigned.every((i) => i.on === (expect === 'on'))
      return { ok, text: assigned.map(describe).join('; ') }
    }
    const ok = assigned.every((i) => i.volts >= expect.minVolts && i.volts <= expect.maxVolts)
    return { ok, text: assigned.map(describe).join('; ') }
  }
  const digital = circuit.inputs.find((i) => i.point === input.point)
  if (typeof expect === 'string') {
    if (!digital) return { ok: false, text: `${pointName(input.point, sample.state)} is not a digital input` }
    return {
      ok: digital.on === (expect === 'on'),
      text: `${pointName(input.point, sample.state)} was ${digital.on ? 'ON' : 'OFF'} at ${formatVolts(digital.volts)}`,
    }
  }
  const volts = digital
    ? digital.volts
    : input.point === 'drive.ai'
      ? circuit.analogVolts
      : (circuit.nodes[input.point] ?? 0)
  return {
    ok: volts >= expect.minVolts && volts <= expect.maxVolts,
    text: `${pointName(input.point, sample.state)} read ${formatVolts(volts)} (wanted ${formatVolts(expect.minVolts)} to ${formatVolts(expect.maxVolts)})`,
  }
}

export const wiringCondition: Evaluator<'wiringCondition'> = (objective, { start }) => {
  // Only the last qualifying moment decides: the wiring as finally left is what counts.
  const holds = conditionTest(objective.while)
  const situation = describeCondition(objective.while, start.state)
  return folding<Sample | undefined>(
    undefined,
    (last, sample) => {
      // A moment read alike at the same time (a meter probe moved) would be judged the same.
      if (last && sample.t === last.t && sameCircuitButMeter(last.state, sample.state)) return last
      return holds(sample.state) && sample.supplyOn ? sample : last
    },
    (last) => {
      if (!last) {
        return {
          met: false,
          evidence: `Never tried with ${situation} while the control supply was on, so ${selectorName(objective.input, start.state)} was not checked.`,
        }
      }
      const judgement = judgeMoment(objective, last)
      return {
        met: judgement.ok,
        evidence: `At ${formatTime(last.t)}, with ${situation}, ${judgement.text}.`,
        at: last.t,
      }
    },
  )
}
