// The whole panel mounts on the real model (Pixi mocked), records actions from its keyboard
// controls into the attempt saved locally, and leaves no listeners behind when unmounted.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { createPinia } from 'pinia'
import { createVuetify } from 'vuetify'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { scenarioSchema } from '@shared/scenario/schema'
import { attemptStorageKey } from '@/simulator/composables/useAttemptStorage'
import { pixiState, resetPixiState } from './pixiMock'

vi.mock('pixi.js', () => import('./pixiMock'))
vi.mock('pixi.js/unsafe-eval', () => ({}))

const { default: SimulatorPanel } = await import('@/simulator/components/SimulatorPanel.vue')
const scenario = scenarioSchema.parse(scenarioFile)
const key = attemptStorageKey(scenario.id)

function mountPanel() {
  return mount(SimulatorPanel, {
    props: { scenario, mode: 'practice' },
    global: { plugins: [createVuetify(), createPinia()] },
    attachTo: document.body,
  })
}

async function settle() {
  await new Promise((r) => setTimeout(r, 30))
  await flushPromises()
}

describe('the simulator panel', () => {
  beforeEach(() => {
    resetPixiState()
    localStorage.clear()
  })
  afterEach(() => localStorage.clear())

  it('records an action from its controls in the attempt saved in this browser', async () => {
    const wrapper = mountPanel()
    await settle()
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    const saved = JSON.parse(localStorage.getItem(key) ?? 'null')
    expect(saved.events.map((e: { type: string }) => e.type)).toEqual(['lock.removed'])
    wrapper.unmount()
  })

  it('resumes the saved attempt after a remount with the same attempt id', async () => {
    const first = mountPanel()
    await settle()
    await first.get('[data-testid="control-lock"]').trigger('click')
    const id = JSON.parse(localStorage.getItem(key)!).attemptId
    first.unmount()
    const second = mountPanel()
    await settle()
    expect(second.text()).toContain('Resumed the attempt saved in this browser (1 actions)')
    expect(second.get('[data-testid="control-lock"]').text()).toContain('Apply my lock')
    expect(JSON.parse(localStorage.getItem(key)!).attemptId).toBe(id)
    second.unmount()
  })

  it('removes its keyboard listeners and the Pixi application on unmount, every time', async () => {
    const added = vi.spyOn(window, 'addEventListener')
    const removed = vi.spyOn(window, 'removeEventListener')
    for (let i = 0; i < 5; i++) {
      const wrapper = mountPanel()
      await settle()
      wrapper.unmount()
    }
    // Every keyboard handler added to the window has been taken off again.
    for (const type of ['keydown', 'keyup', 'blur']) {
      const handlers = (spy: typeof added) =>
        new Set(spy.mock.calls.filter((c) => c[0] === type).map((c) => c[1]))
      const stillOn = [...handlers(added)].filter((h) => !handlers(removed).has(h))
      expect(stillOn).toEqual([])
      expect(handlers(added).size).toBeGreaterThanOrEqual(5)
    }
    expect(pixiState.initialised).toBe(5)
    expect(pixiState.destroyed).toBe(5)
    expect(pixiState.callbacks.size).toBe(0)
    added.mockRestore()
    removed.mockRestore()
  })
})
