// The actor the panel uses (@xstate/vue): it applies and records events and lets time run.
import { describe, expect, it } from 'vitest'
import { createActor } from 'xstate'
import { readDrive, replay } from '@shared/model'
import { simulationMachine } from '@/simulator/machines/simulationMachine'
import { toSimulationSetup } from '@shared/scenario/setup'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/two-wire-run-stop.json'

const raiseLowerSetup = () => toSimulationSetup(scenarioSchema.parse(scenarioFile))

describe('simulationMachine', () => {
  it('applies recorded events and keeps them as the attempt log', () => {
    const actor = createActor(simulationMachine, { input: { setup: raiseLowerSetup() } }).start()
    actor.send({ type: 'record', event: { t: 100, type: 'device.switched', device: 'runSwitch', position: 1 } })
    actor.send({ type: 'tick', t: 2100 })
    const { sim, log } = actor.getSnapshot().context
    expect(log).toHaveLength(1)
    expect(sim.t).toBe(2100)
    expect(readDrive(sim).lineOn).toBe(false)
    actor.stop()
  })

  it('ignores an event stamped before the current time (nothing recorded, nothing lost)', () => {
    const actor = createActor(simulationMachine, { input: { setup: raiseLowerSetup() } }).start()
    actor.send({ type: 'tick', t: 1000 })
    actor.send({ type: 'record', event: { t: 500, type: 'lock.removed' } })
    expect(actor.getSnapshot().context.log).toEqual([])
    expect(readDrive(actor.getSnapshot().context.sim).lineOn).toBe(false)
    actor.stop()
  })

  it('resumes a saved log and reaches the same state as a replay of it', () => {
    const log = [
      { t: 100, type: 'device.switched', device: 'runSwitch', position: 1 } as const,
      { t: 900, type: 'device.switched', device: 'runSwitch', position: 0 } as const,
    ]
    const actor = createActor(simulationMachine, { input: { setup: raiseLowerSetup(), log } }).start()
    const fromReplay = replay(raiseLowerSetup(), log).segments.at(-1)!.state
    expect(JSON.stringify(actor.getSnapshot().context.sim)).toBe(JSON.stringify(fromReplay))
    actor.send({ type: 'restart' })
    expect(actor.getSnapshot().context.log).toEqual([])
    actor.stop()
  })
})
