// The live task sheet after an instructor puts a fault in: the apprentice sees the objectives it brought
// (graded by the real grader, as the live grader does), in words that never name the fault, with their points;
// in an assessment, where nothing is ticked live, the sheet lists the scenario's objectives only.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { createVuetify } from 'vuetify'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import type { AttemptEvent } from '@shared/model/events'
import { grade } from '@shared/scenario/grade'
import { scenarioSchema } from '@shared/scenario/schema'
import PanelTaskPanel from '@/simulator/components/PanelTaskPanel.vue'
import { liveObjectiveTicks } from '@/simulator/components/liveObjectives'

const scenario = scenarioSchema.parse(scenarioFile)
const events: AttemptEvent[] = [
  { t: 1000, type: 'wire.added', id: 'w1', from: 'drive.p24', to: 'runSwitch.a', colour: 'blue' },
  { t: 2000, type: 'wire.added', id: 'w2', from: 'runSwitch.b', to: 'drive.di1', colour: 'blue' },
  {
    t: 3000,
    type: 'fault.injected',
    injectionId: '00000000-0000-4000-8000-0000000000e1',
    fault: { kind: 'brokenWire', wireId: 'w2' },
    by: { id: '00000000-0000-4000-8000-0000000000a1', name: 'Ottilie Marsh' },
  },
]

function sheet(liveTicks: boolean, log = events) {
  return mount(PanelTaskPanel, {
    props: {
      scenario,
      objectives: liveObjectiveTicks(scenario, grade(scenario, log), liveTicks),
      ticks: liveTicks,
    },
    global: { plugins: [createVuetify()] },
  })
}
const items = (wrapper: ReturnType<typeof sheet>) =>
  wrapper.findAll('[data-testid="objectives"] li').map((li) => li.text())

describe('the live task sheet after an instructor puts a fault in', () => {
  it('adds the objectives the fault brought, open, with their points, never naming the fault', () => {
    const listed = items(sheet(true))
    expect(listed).toHaveLength(scenario.objectives.length + 3)
    const added = listed.slice(scenario.objectives.length)
    expect(added).toEqual([
      '○The fault your instructor put in: put right, working safely (not met yet)\u00a0· 10 pts',
      '○The fault your instructor put in: diagnosed correctly (not met yet)\u00a0· 5 pts',
      '○The fault your instructor put in: found by measurement (not met yet)\u00a0· 5 pts',
    ])
    expect(added.join(' ')).not.toMatch(/wire|W2|broke/i)
  })

  it('lists nothing more before a fault is put in', () => {
    expect(items(sheet(true, events.slice(0, 2)))).toHaveLength(scenario.objectives.length)
  })

  it('keeps an assessment to the scenario’s own objectives, unticked', () => {
    const listed = items(sheet(false))
    expect(listed).toHaveLength(scenario.objectives.length)
    expect(listed.join(' ')).not.toContain('your instructor')
  })
})
