// The scenario's start read back from a simulation (the author's set-up on the panel): every shipped
// scenario survives the round trip unchanged, and what the author does on the panel (wires, saved
// settings, power, lock, devices) shows in the start; unsaved edits and injected faults do not.
import { readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { applyEvent, createSimulation, type AttemptEvent, type SimState } from '@shared/model'
import { checkScenario, toSimulationSetup, type Scenario } from '@shared/scenario'
import { startingStateFromSimulation } from '@shared/scenario/startFromState'
import { shippedScenario } from './helpers'

const shippedIds = readdirSync(resolve(import.meta.dirname, '../../../scenarios'))
  .filter((f) => f.endsWith('.json'))
  .map((f) => f.replace(/\.json$/, ''))

/** An event without its time (play() gives each its own). */
type Action = AttemptEvent extends infer E ? (E extends AttemptEvent ? Omit<E, 't'> : never) : never

function play(scenario: Scenario, events: Action[], faults = false): SimState {
  const setup = toSimulationSetup(scenario)
  if (!faults) setup.faults = []
  let sim = createSimulation(setup)
  events.forEach((e, i) => (sim = applyEvent(sim, { ...e, t: (i + 1) * 100 } as AttemptEvent)))
  return sim
}

describe('startingStateFromSimulation', () => {
  it('finds every shipped scenario', () => expect(shippedIds.length).toBeGreaterThanOrEqual(10))

  it.each(shippedIds)('gives %s its own start back (with its faults in the simulation)', (id) => {
    const scenario = shippedScenario(id)
    const start = startingStateFromSimulation(play(scenario, [], true), scenario.start)
    expect(start).toEqual(scenario.start)
    // And the result is still a valid scenario.
    expect(checkScenario({ ...scenario, start }).ok).toBe(true)
  })

  it('adds a wire the author drew and drops one taken off', () => {
    const scenario = shippedScenario('creeping-speed-wrong-contact')
    const sim = play(scenario, [
      { type: 'power.off' },
      { type: 'wire.removed', id: 'wCom' },
      { type: 'wire.added', id: 'wNew', from: 'drive.dcom', to: 'drive.0v', colour: 'white' },
    ])
    const start = startingStateFromSimulation(sim, scenario.start)
    expect(start.wires.map((w) => w.id)).not.toContain('wCom')
    expect(start.wires).toContainEqual({ id: 'wNew', from: 'drive.dcom', to: 'drive.0v', colour: 'white' })
    expect(start.power).toEqual({ on: false, locked: false })
  })

  it('keeps a setting saved on the keypad and ignores one changed but not saved', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    expect(scenario.start.settings['ramp.accelSeconds']).toBeUndefined()
    const saved = startingStateFromSimulation(
      play(scenario, [
        { type: 'setting.changed', key: 'ramp.accelSeconds', value: 12 },
        { type: 'settings.saved' },
      ]),
      scenario.start,
    )
    expect(saved.settings['ramp.accelSeconds']).toBe(12)
    expect(saved.settings['reference.keypadSetpoint']).toBe(35)

    const unsaved = startingStateFromSimulation(
      play(scenario, [{ type: 'setting.changed', key: 'ramp.accelSeconds', value: 12 }]),
      scenario.start,
    )
    expect(unsaved.settings['ramp.accelSeconds']).toBeUndefined()
  })

  it('records the disconnect off and locked, and a switch turned', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const sim = play(scenario, [
      { type: 'device.switched', device: 'runSwitch', position: 1 },
      { type: 'power.off' },
      { type: 'lock.applied', tag: { name: 'Author', date: '2026-12-03' } },
    ])
    const start = startingStateFromSimulation(sim, scenario.start)
    expect(start.power).toEqual({ on: false, locked: true })
    expect(start.devices[0]).toMatchObject({ id: 'runSwitch', position: 1 })
    expect(start.machine).toEqual(scenario.start.machine)
    expect(start.motor).toEqual(scenario.start.motor)
  })

  it('records a contact block fitted and a motor conductor moved', () => {
    const scenario = shippedScenario('two-wire-run-stop')
    const sim = play(scenario, [
      { type: 'power.off' },
      { type: 'device.contactFitted', device: 'runSwitch', contact: 'NC' },
      { type: 'motor.conductorLanded', conductor: 'u', terminal: null },
    ])
    const start = startingStateFromSimulation(sim, scenario.start)
    expect(start.devices[0]).toMatchObject({ contact: 'NC' })
    expect(start.motorCable).toEqual({ u: null, v: 'v1', w: 'w1' })
  })
})
