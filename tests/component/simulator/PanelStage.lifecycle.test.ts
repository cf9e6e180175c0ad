// The Pixi application lives exactly as long as the panel: no leaked apps or ticker callbacks.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { createVuetify } from 'vuetify'
import { layoutPanel } from '@/simulator/scene/layout'
import { emptyView } from '@/simulator/scene/view'
import { pixiState, resetPixiState } from './pixiMock'

vi.mock('pixi.js', () => import('./pixiMock'))

const { default: PanelStage } = await import('@/simulator/components/PanelStage.vue')

const layout = layoutPanel([
  { id: 'run', kind: 'selector', label: 'Run', contact: 'NO' },
  { id: 'up', kind: 'pushbutton', label: 'Faster', contact: 'NO' },
])

function mountStage() {
  return mount(PanelStage, {
    props: {
      layout,
      render: () => emptyView(),
      hitContext: () => ({ wires: [], probes: { red: null, black: null } }),
      positions: () => ({}),
      interactive: true,
      label: 'Panel',
    },
    global: { plugins: [createVuetify()] },
  })
}

const settle = async () => {
  await new Promise((r) => setTimeout(r, pixiState.initDelayMs + 5))
  await flushPromises()
}

describe('the panel stage lifecycle', () => {
  beforeEach(resetPixiState)
  afterEach(resetPixiState)

  it('creates one application on mount and destroys it with its ticker callbacks on unmount', async () => {
    const wrapper = mountStage()
    await settle()
    expect(pixiState.initialised).toBe(1)
    expect(pixiState.callbacks.size).toBeGreaterThan(0)
    wrapper.unmount()
    expect(pixiState.destroyed).toBe(1)
    expect(pixiState.callbacks.size).toBe(0)
  })

  it('leaks nothing over many mounts and unmounts', async () => {
    for (let i = 0; i < 25; i++) {
      const wrapper = mountStage()
      await settle()
      wrapper.unmount()
    }
    expect(pixiState.initialised).toBe(25)
    expect(pixiState.destroyed).toBe(25)
    expect(pixiState.callbacks.size).toBe(0)
  })

  it('destroys an application whose init finishes after the panel was already unmounted', async () => {
    pixiState.initDelayMs = 30
    const wrapper = mountStage()
    wrapper.unmount()
    expect(pixiState.destroyed).toBe(0)
    await settle()
    expect(pixiState.initialised).toBe(1)
    expect(pixiState.destroyed).toBe(1)
    expect(pixiState.callbacks.size).toBe(0)
  })
})
