// The timeline's words for an instructor's fault: the instructors' views name it from the catalogue of the
// bench just before it; the apprentice's own replay says only that something changed.
import { describe, expect, it } from 'vitest'
import { replay } from '@shared/model'
import type { AttemptEvent } from '@shared/model/events'
import { scenarioSchema } from '@shared/scenario/schema'
import { toSimulationSetup } from '@shared/scenario/setup'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { replayMarks } from '@/simulator/components/replayMarks'
import { layoutPanel } from '@/simulator/scene/layout'

const scenario = scenarioSchema.parse(scenarioFile)
const setup = toSimulationSetup(scenario)
const events: AttemptEvent[] = [
  { t: 1_000, type: 'lock.applied' },
  {
    t: 2_000,
    type: 'fault.injected',
    injectionId: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
    fault: { kind: 'blownFuse' },
    by: { id: '5c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f', name: 'Idris Penhallow' },
  },
]

describe('an injected fault on the timeline', () => {
  const timeline = replay(setup, events)
  const layout = layoutPanel(setup.devices)
  const label = (nameInjections: boolean) =>
    replayMarks(events, timeline, null, layout, { nameInjections }).find((m) => m.t === 2_000)!.label

  it('is named for instructors, with who put it in', () => {
    expect(label(true)).toBe('Idris Penhallow put in a fault: Blow the control fuse')
  })

  it('is only "something changed" for the apprentice', () => {
    expect(label(false)).toBe('Idris Penhallow changed something on the bench')
  })
})
