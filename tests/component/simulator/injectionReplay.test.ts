// Live classroom in the replay: an instructor's fault and messages are marked on the timeline; only the
// instructor's view names the fault; the injected fault's objectives appear from the moment it went in.
import { describe, expect, it } from 'vitest'
import type { AttemptDetail } from '@shared/api/attempts'
import { attemptEventSchema, type AttemptEvent } from '@shared/model/events'
import { scenarioSchema } from '@shared/scenario/schema'
import deadCircuitFile from '../../../scenarios/dead-control-circuit.json'
import deadCircuitReference from '../../fixtures/attempts/dead-control-circuit--reference.json'
import { objectivesAt, replayMarks } from '@/simulator/components/replayMarks'
import { prepareReplay } from '@/simulator/machines/replayMachine'
import { eventWords, injectedFaultWords, injectionWords } from '@/simulator/scene/eventWords'
import { layoutPanel } from '@/simulator/scene/layout'

const scenario = scenarioSchema.parse(deadCircuitFile)
const layout = layoutPanel(scenario.start.devices)
const by = { id: '00000000-0000-4000-8000-0000000000d1', name: 'Ottilie Marsh' }
const reference = (deadCircuitReference as { events: unknown[] }).events.map((e) =>
  attemptEventSchema.parse(e),
)

/** The reference repair with the run feed wire broken by the instructor after the third event, and a hint. */
function withInjection(): AttemptEvent[] {
  const events = [...reference]
  const at = events[2]!.t
  events.splice(3, 0, {
    t: at,
    type: 'fault.injected',
    injectionId: '00000000-0000-4000-8000-0000000000e1',
    fault: { kind: 'brokenWire', wireId: 'wRunFeed' },
    by,
  })
  events.splice(4, 0, {
    t: at,
    type: 'message.received',
    messageId: '00000000-0000-4000-8000-0000000000e2',
    kind: 'hint',
    text: 'Check the supply first.',
    from: by,
  })
  return events
}
const attempt = (events: AttemptEvent[]) =>
  ({ id: 'a1', userName: 'Ravi Lindqvist', events }) as AttemptDetail

describe('injections and messages in the replay', () => {
  it('names each kind of fault in words for the instructor, never by id', () => {
    expect(injectedFaultWords({ kind: 'blownFuse' }, layout)).toBe('blew the control fuse')
    expect(injectedFaultWords({ kind: 'contactWelded', device: 'runSwitch' }, layout)).toBe(
      'welded the contact of Fan run / stop closed',
    )
    expect(injectedFaultWords({ kind: 'inputUnresponsive', input: 3 }, layout)).toBe(
      'made input DI3 stop responding',
    )
    expect(injectedFaultWords({ kind: 'settingChanged', key: 'speed.max', value: 25 }, layout)).toMatch(
      /^changed Maximum speed to 25/,
    )
    expect(injectedFaultWords({ kind: 'motorConductorOpen', conductor: 'v' }, layout)).toBe(
      'broke conductor V inside the motor cable',
    )
  })

  it('marks the injection and the hint; the apprentice’s replay does not name the fault', () => {
    const data = prepareReplay({ attempt: attempt(withInjection()), scenario })
    const own = replayMarks(data.events, data.timeline, data.graded, layout)
    const injection = own.find((m) => m.kind === 'injection')!
    expect(injection.label).toBe('Ottilie Marsh changed something on the bench')
    expect(own.find((m) => m.kind === 'message')?.label).toBe(
      'Hint from Ottilie Marsh: Check the supply first.',
    )

    const instructor = replayMarks(data.events, data.timeline, data.graded, layout, 'instructor')
    // The run feed is the second wire on the panel: its marker is W2 and its colour code.
    expect(instructor.find((m) => m.kind === 'injection')?.label).toMatch(
      /^Ottilie Marsh put in a fault: broke wire W2 \w+$/,
    )
    for (const m of instructor) expect(m.label).not.toMatch(/wRunFeed|brokenWire/)
  })

  it('shows the injected fault’s objectives from the moment it went in', () => {
    const events = withInjection()
    const data = prepareReplay({ attempt: attempt(events), scenario })
    const injectedAt = events[3]!.t
    const titles = (t: number) =>
      objectivesAt(scenario, data.graded, t, data.timeline.end).map((o) => o.title)
    const ownCount = scenario.objectives.length
    expect(titles(injectedAt - 1)).toHaveLength(ownCount)
    const after = titles(injectedAt)
    expect(after).toHaveLength(ownCount + 3)
    expect(after.slice(ownCount)).toEqual([
      'The fault your instructor put in: put right, working safely',
      'The fault your instructor put in: diagnosed correctly',
      'The fault your instructor put in: found by measurement',
    ])
  })

  it('keeps the words for the apprentice’s live announcements unchanged', () => {
    const event = withInjection()[3]!
    expect(eventWords(event, layout)).toBe('Ottilie Marsh changed something on the bench')
    if (event.type === 'fault.injected')
      expect(injectionWords(event, layout, 'W2 BU')).toBe('Ottilie Marsh put in a fault: broke wire W2 BU')
  })
})
