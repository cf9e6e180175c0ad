// The replay's Schematic tab draws the control circuit as it was at the playhead: a wire added later in
// the attempt is not on the drawing before it was added, and is after; a wire removed is gone.
import { describe, expect, it } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { computed, ref, shallowRef } from 'vue'
import { createVuetify } from 'vuetify'
import type { AttemptDetail } from '@shared/api/attempts'
import { sampleTimeline } from '@shared/model'
import type { AttemptEvent } from '@shared/model/events'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import ReplaySheet from '@/simulator/components/ReplaySheet.vue'
import type { Replay } from '@/simulator/composables/useReplay'
import { prepareReplay } from '@/simulator/machines/replayMachine'
import { layoutPanel } from '@/simulator/scene/layout'

const scenario = scenarioSchema.parse(scenarioFile)
const log: AttemptEvent[] = [
  { t: 1000, type: 'wire.added', id: 'w1', from: 'drive.p24', to: 'runSwitch.a', colour: 'blue' },
  { t: 4000, type: 'wire.added', id: 'w2', from: 'runSwitch.b', to: 'drive.di1', colour: 'blue' },
  { t: 7000, type: 'wire.removed', id: 'w1' },
]

/** The replay as the page holds it, with the playhead where a test puts it (what useReplay publishes). */
function replayAt(t: number) {
  const data = prepareReplay({
    attempt: { id: 'a1', userName: 'Apprentice', events: log } as AttemptDetail,
    scenario,
  })
  const shown = shallowRef(sampleTimeline(data.timeline, t))
  const position = ref(t)
  const replay = {
    data: computed(() => data),
    shown,
    position,
    layout: computed(() => layoutPanel(scenario.start.devices)),
    trend: computed(() => []),
    send: () => {},
  } as unknown as Replay
  const seek = (to: number) => {
    shown.value = sampleTimeline(data.timeline, to)
    position.value = to
  }
  return { replay, seek }
}

async function waitForDrawing(wrapper: ReturnType<typeof mount>) {
  for (let i = 0; i < 50 && !wrapper.find('[data-testid="schematic-drawing"] svg').exists(); i++) {
    await new Promise((r) => setTimeout(r, 20))
    await flushPromises()
  }
  return wrapper.get('[data-testid="schematic-drawing"] svg')
}

/** The wire markers on the drawing, e.g. ["W2 BU"]. */
const markers = (svg: ReturnType<ReturnType<typeof mount>['get']>) =>
  [...(svg.element as Element).querySelectorAll('text')]
    .map((t) => t.textContent ?? '')
    .filter((s) => /^W\d+ /.test(s))

describe('the replay’s Schematic tab', () => {
  it('draws the wiring as it was at the playhead, and follows the playhead when it moves', async () => {
    const { replay, seek } = replayAt(2000)
    const wrapper = mount(ReplaySheet, {
      props: { replay, marks: [] },
      global: { plugins: [createVuetify()] },
      attachTo: document.body,
    })
    await wrapper.get('[data-testid="tab-schematic"]').trigger('click')
    let svg = await waitForDrawing(wrapper)
    expect(svg.attributes('role')).toBe('img')
    expect(svg.find('title').text()).toContain(scenario.title)
    expect(markers(svg)).toEqual(['W1 BU'])
    expect(wrapper.text()).toContain('As wired at 00:02')

    seek(5000)
    await flushPromises()
    svg = await waitForDrawing(wrapper)
    expect(markers(svg).sort()).toEqual(['W1 BU', 'W2 BU'])

    seek(8000)
    await flushPromises()
    svg = await waitForDrawing(wrapper)
    expect(markers(svg)).toEqual(['W2 BU'])

    seek(0)
    await flushPromises()
    svg = await waitForDrawing(wrapper)
    expect(markers(svg)).toEqual([])
    wrapper.unmount()
  })

  it('takes the whole window for the drawing on request, and gives it back on Escape', async () => {
    const { replay } = replayAt(5000)
    const wrapper = mount(ReplaySheet, {
      props: { replay, marks: [] },
      global: { plugins: [createVuetify()] },
      attachTo: document.body,
    })
    await wrapper.get('[data-testid="tab-schematic"]').trigger('click')
    await waitForDrawing(wrapper)
    const root = wrapper.get('[data-testid="schematic"]')
    expect(root.attributes('role')).toBeUndefined()
    await wrapper.get('[data-testid="schematic-large"]').trigger('click')
    expect(root.attributes('role')).toBe('dialog')
    expect(root.attributes('aria-label')).toContain('Control circuit as wired')
    await root.trigger('keydown', { key: 'Escape' })
    expect(root.attributes('role')).toBeUndefined()
    wrapper.unmount()
  })
})
