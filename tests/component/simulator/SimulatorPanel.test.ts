// The whole live panel mounts on the real model and machine (Pixi mocked, the network replaced):
// it records actions from its keyboard controls into the attempt saved in this browser, resumes it
// after a remount, and leaves no listeners or Pixi application behind when unmounted.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { createPinia } from 'pinia'
import { createVuetify } from 'vuetify'
import { fromCallback, fromPromise } from 'xstate'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import conflictFile from '../../../scenarios/configuration-conflict-alarm.json'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import { scenarioSchema } from '@shared/scenario/schema'
import { attemptStorageKey, createAttemptStore } from '@/simulator/storage/attemptStore'
import { pixiState, resetPixiState } from './pixiMock'

vi.mock('pixi.js', () => import('./pixiMock'))
vi.mock('pixi.js/unsafe-eval', () => ({}))

const scenario = scenarioSchema.parse(scenarioFile)
// What the next mounted panel starts with (the level is what loadStart settled on).
interface StartingAssignment {
  title: string
  attemptLimit: number | null
  attemptsUsed: number
  hintsAllowed: boolean
}
const starting: {
  scenario: typeof scenario
  assistance: AssistanceLevel
  assignment: StartingAssignment | null
} = {
  scenario,
  assistance: 'standard',
  assignment: null,
}
const key = attemptStorageKey('version-1')

// The app's actors without the network: the scenario is at hand, the browser copy is real.
vi.mock('@/simulator/services', () => ({
  liveAttemptActors: () => ({
    loadStart: fromPromise(async () => {
      const store = createAttemptStore(key)
      const local = store.load()
      return {
        scenario: starting.scenario,
        scenarioTitle: starting.scenario.title,
        scenarioVersionId: 'version-1',
        assignment: starting.assignment,
        assistance: starting.assistance,
        store,
        browser: local.copy ? { source: 'browser', ...local.copy } : null,
        server: null,
        problem: local.problem,
      }
    }),
    loadServerCopy: fromPromise(async () => Promise.reject(new Error('offline'))),
    saveProgress: fromPromise(async () => Promise.reject(new Error('offline'))),
    submitAttempt: fromPromise(async () => Promise.reject(new Error('offline'))),
    liveGrading: fromCallback(() => () => {}),
  }),
  replayActors: () => ({}),
}))

const { default: SimulatorPanel } = await import('@/simulator/components/SimulatorPanel.vue')
const { default: PanelWiring } = await import('@/simulator/components/PanelWiring.vue')

function mountPanel() {
  return mount(SimulatorPanel, {
    props: {
      request: { kind: 'live', target: { mode: 'practice', scenarioKey: scenario.id } },
      tourReady: false,
    },
    global: { plugins: [createVuetify(), createPinia()] },
    attachTo: document.body,
  })
}

async function settle() {
  await new Promise((r) => setTimeout(r, 30))
  await flushPromises()
  await new Promise((r) => setTimeout(r, 30))
  await flushPromises()
}

const saved = () => createAttemptStore(key).load().copy

describe('the simulator panel', () => {
  beforeEach(() => {
    resetPixiState()
    localStorage.clear()
    starting.scenario = scenario
    starting.assistance = 'standard'
    starting.assignment = null
  })
  afterEach(() => localStorage.clear())

  it('records an action from its controls in the attempt saved in this browser', async () => {
    const wrapper = mountPanel()
    await settle()
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    expect(saved()?.events.map((e) => e.type)).toEqual(['lock.applied'])
    wrapper.unmount()
  })

  it('asks before removing the apprentice’s lock, and keeps it on when the question is declined', async () => {
    const wrapper = mountPanel()
    await settle()
    const lock = () => wrapper.get('[data-testid="control-lock"]')
    await lock().trigger('click')
    await lock().trigger('click')
    await settle()
    const dialog = () => document.querySelector<HTMLElement>('[data-testid="unlock-confirm"]')
    expect(dialog()?.textContent).toContain('Remove your lock?')
    expect(dialog()?.textContent).toContain("Rena Dubrovny's lock stays on the disconnect")
    document.querySelector<HTMLElement>('[data-testid="unlock-cancel"]')!.click()
    await settle()
    expect(saved()?.events.map((e) => e.type)).toEqual(['lock.applied'])
    await lock().trigger('click')
    await settle()
    document.querySelector<HTMLElement>('[data-testid="unlock-yes"]')!.click()
    await settle()
    expect(saved()?.events.map((e) => e.type)).toEqual(['lock.applied', 'lock.removed'])
    wrapper.unmount()
  })

  it('shows the supervisor’s lock in words and refuses to let the apprentice remove it', async () => {
    const wrapper = mountPanel()
    await settle()
    expect(wrapper.get('[data-testid="control-locks"]').text()).toContain("Rena Dubrovny's lock")
    await wrapper.get('[data-testid="control-supervisor-lock-remove"]').trigger('click')
    await settle()
    expect(document.body.textContent).toContain("That lock is Rena Dubrovny's.")
    await wrapper.get('[data-testid="control-supervisor-lock-ask"]').trigger('click')
    await settle()
    expect(wrapper.find('[data-testid="control-supervisor-lock-ask"]').exists()).toBe(false)
    expect(wrapper.get('[data-testid="control-locks"]').text()).toBe('No lock on the disconnect.')
    wrapper.unmount()
  })

  it('resumes the saved attempt after a remount with the same attempt id', async () => {
    const first = mountPanel()
    await settle()
    await first.get('[data-testid="control-lock"]').trigger('click')
    const id = saved()?.attemptId
    first.unmount()
    const second = mountPanel()
    await settle()
    expect(document.body.textContent).toContain('Resumed the attempt saved in this browser (1 action)')
    expect(second.get('[data-testid="control-lock"]').text()).toContain('Remove my lock')
    expect(saved()?.attemptId).toBe(id)
    second.unmount()
  })

  it('draws the wiring in its Schematic tab and redraws it when a wire is added', async () => {
    const wrapper = mountPanel()
    await settle()
    await wrapper.get('[data-testid="tab-schematic"]').trigger('click')
    const markers = async () => {
      for (let i = 0; i < 50 && !wrapper.find('[data-testid="schematic-drawing"] svg').exists(); i++) {
        await settle()
      }
      const svg = wrapper.get('[data-testid="schematic-drawing"] svg')
      expect(svg.attributes('role')).toBe('img')
      return [...svg.element.querySelectorAll('text')]
        .map((t) => t.textContent ?? '')
        .filter((text) => /^W\d+ /.test(text))
    }
    expect(await markers()).toEqual([])
    expect(wrapper.get('[data-testid="schematic"]').text()).toContain('0 wires')
    // On the Wiring tab, the "Add a wire…" picker emits this when both ends are chosen.
    await wrapper.get('[data-testid="tab-wiring"]').trigger('click')
    await settle()
    wrapper.findComponent(PanelWiring).vm.$emit('addWire', 'drive.p24', 'runSwitch.a', 'brown')
    await settle()
    await wrapper.get('[data-testid="tab-schematic"]').trigger('click')
    expect(await markers()).toEqual(['W1 BN'])
    expect(wrapper.get('[data-testid="schematic"]').text()).toContain('1 wire.')
    wrapper.unmount()
  })

  describe('follows the attempt’s assistance level', () => {
    const alarmScenario = scenarioSchema.parse(conflictFile)

    it('at standard: no Values tab, alarms by short code and what is wrong, without the fix', async () => {
      starting.scenario = alarmScenario
      const wrapper = mountPanel()
      await settle()
      expect(wrapper.get('[data-testid="assistance-level"]').text()).toBe('Assistance: Standard')
      expect(wrapper.find('[data-testid="tab-live"]').exists()).toBe(false)
      expect(wrapper.findAll('.v-tab').map((t) => t.text())).not.toContain('Values')
      const notice = wrapper.get('[data-testid="drive-notice"]')
      expect(notice.text()).toMatch(/Alarm W-[A-Z]+: /)
      expect(wrapper.find('[data-testid="drive-notice-fix"]').exists()).toBe(false)
      expect(wrapper.get('[data-testid="drive-notices"]').text()).not.toContain('What to check')
      wrapper.unmount()
    })

    it('at guided: the Values tab and the alarm’s fix', async () => {
      starting.scenario = alarmScenario
      starting.assistance = 'guided'
      const wrapper = mountPanel()
      await settle()
      expect(wrapper.get('[data-testid="assistance-level"]').text()).toBe('Assistance: Guided')
      expect(wrapper.find('[data-testid="tab-live"]').exists()).toBe(true)
      expect(wrapper.get('[data-testid="drive-notice-fix"]').text()).toMatch(/^What to check: .+/)
      wrapper.unmount()
    })

    it('in an assessment: no hints and no ticks', async () => {
      starting.assistance = 'assessment'
      const wrapper = mountPanel()
      await settle()
      expect(wrapper.get('[data-testid="assistance-level"]').text()).toBe('Assistance: Assessment')
      expect(wrapper.find('[data-testid="no-hints"]').exists()).toBe(scenario.hints.length > 0)
      expect(wrapper.findAll('button').filter((b) => b.text().startsWith('Show a hint'))).toHaveLength(0)
      expect(wrapper.find('[data-testid="objectives-unticked"]').exists()).toBe(true)
      expect(wrapper.get('[data-testid="objectives"]').text()).not.toMatch(/not met yet|✔|○/)
      wrapper.unmount()
    })

    it('at standard, hints are offered at their cost and objectives are ticked', async () => {
      const wrapper = mountPanel()
      await settle()
      const offers = wrapper.findAll('button').filter((b) => b.text().startsWith('Show a hint'))
      expect(offers.length).toBe(scenario.hints.length)
      expect(offers[0]?.text()).toContain(`costs ${scenario.hints[0]!.cost} points`)
      expect(wrapper.get('[data-testid="objectives"]').text()).toContain('not met yet')
      wrapper.unmount()
    })
  })

  it('says beside each hint which objectives it helps with, as the author attached it', async () => {
    const wrapper = mountPanel()
    await settle()
    const hints = wrapper.findAll('[data-testid="hint"]')
    expect(hints).toHaveLength(scenario.hints.length)
    scenario.hints.forEach((hint, i) => {
      const titles = scenario.objectives.filter((o) => o.hints?.includes(hint.id)).map((o) => o.title)
      const caption = hints[i]!.find('p')
      if (!titles.length) expect(caption.exists()).toBe(false)
      else for (const title of titles) expect(caption.text()).toContain(`“${title}”`)
    })
    // The shipped scenario attaches its first hint to two objectives: both are named.
    expect(hints[0]!.text()).toMatch(/^For “.+” and “.+”/)
    wrapper.unmount()
  })

  it('names the scenario under an assignment only when the assignment is titled differently', async () => {
    const assignment = { attemptLimit: null, attemptsUsed: 0, hintsAllowed: true }
    starting.assignment = { ...assignment, title: scenario.title }
    const same = mountPanel()
    await settle()
    expect(same.find('h1').text()).toBe(scenario.title)
    expect(same.find('[data-testid="workspace-subtitle"]').exists()).toBe(false)
    same.unmount()
    localStorage.clear()

    starting.assignment = { ...assignment, title: 'Week 3 practical' }
    const renamed = mountPanel()
    await settle()
    expect(renamed.find('h1').text()).toBe('Week 3 practical')
    expect(renamed.get('[data-testid="workspace-subtitle"]').text()).toBe(scenario.title)
    renamed.unmount()
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
  }, 30_000)
})
