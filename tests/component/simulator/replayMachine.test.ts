// The replay: the attempt is loaded once and replayed once; the keypad shows its menus as they were;
// play, pause, speed and scrubbing move the playhead; objectives read met, not yet, or missed.
import { describe, expect, it } from 'vitest'
import { createActor, fromPromise, waitFor } from 'xstate'
import type { AttemptDetail } from '@shared/api/attempts'
import { attemptEventSchema, type AttemptEvent } from '@shared/model/events'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import mistake from '../../fixtures/attempts/raise-lower-commissioning--mistake-released-raise-early.json'
import deadCircuitFile from '../../../scenarios/dead-control-circuit.json'
import deadCircuitReference from '../../fixtures/attempts/dead-control-circuit--reference.json'
import { objectivesAt, replayMarks } from '@/simulator/components/replayMarks'
import { prepareReplay, replayMachine, REPLAY_TAIL_MS } from '@/simulator/machines/replayMachine'
import { layoutPanel } from '@/simulator/scene/layout'

const scenario = scenarioSchema.parse(scenarioFile)
const attempt = (events: AttemptEvent[]) =>
  ({ id: 'a1', userName: 'Ravi Lindqvist', events }) as AttemptDetail
const mistakeLog = (mistake as { events: unknown[] }).events.map((e) => attemptEventSchema.parse(e))

const keypadLog: AttemptEvent[] = [
  { t: 1000, type: 'supervisorLock.removed' },
  { t: 2000, type: 'power.on' },
  { t: 8000, type: 'keypad.key', key: 'enter' },
  { t: 9000, type: 'keypad.key', key: 'down' },
  { t: 10_000, type: 'keypad.key', key: 'enter' },
  { t: 12_000, type: 'keypad.key', key: 'back' },
  { t: 13_000, type: 'keypad.key', key: 'back' },
]

function open(events: AttemptEvent[]) {
  let loads = 0
  const machine = replayMachine.provide({
    actors: {
      loadReplay: fromPromise(async () => {
        loads++
        return { attempt: attempt(events), scenario }
      }),
    },
  })
  const actor = createActor(machine, { input: { attemptId: 'a1' } }).start()
  return { actor, loads: () => loads }
}

describe('the replay', () => {
  it('loads the attempt once and shows the keypad’s menus as they were at each moment', async () => {
    const { actor, loads } = open(keypadLog)
    await waitFor(actor, (s) => s.matches('ready'))
    expect(loads()).toBe(1)
    const { menus, timeline } = actor.getSnapshot().context.data!
    expect(menus).toHaveLength(timeline.segments.length)
    expect(menus.map((m) => m.screen)).toEqual([
      'status',
      'status',
      'status',
      'groups',
      'groups',
      'settings',
      'groups',
      'status',
    ])
    expect(menus[5]).toEqual({ screen: 'settings', group: 1, item: 0 })
  })

  it('plays at the chosen speed, pauses at the end, and plays again from the start', async () => {
    const { actor } = open(keypadLog)
    await waitFor(actor, (s) => s.matches('ready'))
    const end = actor.getSnapshot().context.data!.end
    expect(end).toBe(13_000 + REPLAY_TAIL_MS)
    actor.send({ type: 'RATE', rate: 4 })
    actor.send({ type: 'PLAY' })
    actor.send({ type: 'FRAME', wallDtMs: 500 })
    expect(actor.getSnapshot().context.position).toBe(2000)
    actor.send({ type: 'PAUSE' })
    actor.send({ type: 'FRAME', wallDtMs: 500 })
    expect(actor.getSnapshot().context.position).toBe(2000)
    actor.send({ type: 'PLAY' })
    actor.send({ type: 'FRAME', wallDtMs: 60_000 })
    expect(actor.getSnapshot().context.position).toBe(end)
    expect(actor.getSnapshot().matches({ ready: 'paused' })).toBe(true)
    actor.send({ type: 'PLAY' })
    expect(actor.getSnapshot().context.position).toBe(0)
  })

  it('jumps when scrubbed, within the attempt', async () => {
    const { actor } = open(keypadLog)
    await waitFor(actor, (s) => s.matches('ready'))
    actor.send({ type: 'SEEK', t: 9500.4 })
    expect(actor.getSnapshot().context.position).toBe(9500)
    actor.send({ type: 'SEEK', t: -5 })
    expect(actor.getSnapshot().context.position).toBe(0)
  })

  it('says an objective not met by the end is missed, not "not met yet"', () => {
    const data = prepareReplay({ attempt: attempt(mistakeLog), scenario })
    const attemptEnd = data.timeline.end
    const before = objectivesAt(scenario, data.graded, attemptEnd - 1, attemptEnd)
    const after = objectivesAt(scenario, data.graded, attemptEnd, attemptEnd)
    expect(before.find((o) => o.id === 'target-speed')?.state).toBe('open')
    expect(after.find((o) => o.id === 'target-speed')?.state).toBe('missed')
    expect(after.filter((o) => o.state === 'missed').map((o) => o.id)).toEqual(
      (mistake as { misses: string[] }).misses,
    )
    const met = data.graded!.objectives.find((o) => o.met && o.at !== undefined)!
    expect(
      objectivesAt(scenario, data.graded, met.at! - 1, attemptEnd).find((o) => o.id === met.id)?.state,
    ).toBe('open')
    expect(objectivesAt(scenario, data.graded, met.at!, attemptEnd).find((o) => o.id === met.id)?.state).toBe(
      'met',
    )
  })

  it('marks the timeline in plain words, in time order', () => {
    const data = prepareReplay({ attempt: attempt(mistakeLog), scenario })
    const marks = replayMarks(data.events, data.timeline, data.graded, layoutPanel(scenario.start.devices))
    expect(marks.map((m) => m.t)).toEqual([...marks.map((m) => m.t)].sort((a, b) => a - b))
    expect(marks.some((m) => m.label === 'Meter probes on L1 and L2')).toBe(true)
    // Wires named by the marker the panel printed on them, whatever the wire's id.
    expect(marks.some((m) => m.label === 'Wire W3 BU added from Infeed run / stop 14 to DI1')).toBe(true)
    expect(marks.some((m) => m.kind === 'objective' && m.label.startsWith('Objective met: '))).toBe(true)
    for (const m of marks) expect(m.label).not.toMatch(/\b(wire|meter|device|setting)\.[a-z]+/i)
  })

  it('lists each diagnosis, naming the wire by the marker the panel printed on it', () => {
    const dead = scenarioSchema.parse(deadCircuitFile)
    const events = (deadCircuitReference as { events: unknown[] }).events.map((e) =>
      attemptEventSchema.parse(e),
    )
    const data = prepareReplay({ attempt: attempt(events), scenario: dead })
    const marks = replayMarks(data.events, data.timeline, data.graded, layoutPanel(dead.start.devices))
    expect(marks.filter((m) => m.label.startsWith('Diagnosis recorded')).map((m) => m.label)).toEqual([
      'Diagnosis recorded: control fuse: blown',
      'Diagnosis recorded: wire W3 BU: open circuit',
    ])
  })
})
