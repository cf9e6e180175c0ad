// A scenario's draft on the panel (#17), mounted through its routes on the real model and machine (Pixi
// mocked, the network a fetch stub): set-up saves the start built from the panel after a wire is added
// (and refuses while a wire is being drawn); trying the draft grades it on the page and sends nothing;
// recording the reference sends the run's log and shows what the server says it misses.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { defineComponent, h } from 'vue'
import { RouterView } from 'vue-router'
import type { ReferenceResult, ScenarioDraft } from '@shared/api/scenarioAuthoring'
import { STAFF } from '@/router/roles'
import { routes } from '@/router/routes'
import { useSessionStore } from '@/stores/session'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import { sessionBody, stubFetch, testPlugins, type StubCall } from '../client/helpers'
import { resetPixiState } from '../simulator/pixiMock'

vi.mock('pixi.js', () => import('../simulator/pixiMock'))
vi.mock('pixi.js/unsafe-eval', () => ({}))

const { default: DraftView } = await import('@/views/ScenarioDraftPanelView.vue')
const { default: PanelWiring } = await import('@/simulator/components/PanelWiring.vue')
const { default: PanelStage } = await import('@/simulator/components/PanelStage.vue')
// The page loads the panel lazily (its own chunk): loaded here once so each test waits only for the draft.
await import('@/simulator/authoring/DraftSession.vue')

const KEY = scenarioFile.id
const NOW = '2026-12-03T09:00:00.000Z'

function draftBody(document: Record<string, unknown>, result: ReferenceResult | null = null): ScenarioDraft {
  return {
    key: KEY,
    title: String(document.title ?? ''),
    document,
    baseVersion: 1,
    nextVersion: 2,
    createdAt: NOW,
    updatedAt: NOW,
    updatedByName: 'Idris Penhallow',
    problems: [],
    reference: result
      ? { recordedAt: NOW, recordedByName: 'Idris Penhallow', actions: 2, durationMs: 1000, result }
      : null,
    publishable: false,
  }
}

// Two tiny components: the page elsewhere, and the app's router view around the page under test.
// eslint-disable-next-line vue/one-component-per-file
const blank = defineComponent({ render: () => h('div', { 'data-testid': 'elsewhere' }) })
// eslint-disable-next-line vue/one-component-per-file
const App = defineComponent({ render: () => h(RouterView) })

async function settle(rounds = 2) {
  for (let i = 0; i < rounds; i++) {
    await new Promise((r) => setTimeout(r, 30))
    await flushPromises()
  }
}

async function open(
  path: string,
  respond: (call: StubCall) => { status?: number; body?: unknown },
  role = 'instructor',
) {
  const calls = stubFetch(respond)
  const draftRoutes = routes
    .filter((r) => String(r.name).startsWith('scenario-draft-'))
    .map((r) => ({ ...r, component: DraftView }))
  const { pinia, router, vuetify } = testPlugins([
    ...draftRoutes,
    { path: '/scenarios/:id/edit', name: 'scenario-edit', component: blank },
    { path: '/scenarios/:id', name: 'scenario-detail', component: blank },
  ] as never)
  useSessionStore(pinia).user = sessionBody(role as 'instructor' | 'apprentice').user
  await router.push(path)
  const wrapper = mount(App, { global: { plugins: [pinia, router, vuetify] }, attachTo: document.body })
  // The draft, then the lazily loaded panel, then the machine's start.
  for (let i = 0; i < 100 && !wrapper.find('[data-testid="draft-bar"]').exists(); i++) await settle(1)
  return { wrapper, router, calls }
}

const getDraft = (call: StubCall) =>
  call.method === 'GET' && call.url.endsWith(`/scenarios/${KEY}/draft`)
    ? { body: draftBody(structuredClone(scenarioFile)) }
    : { status: 500, body: { error: { code: 'internal_error', message: 'not in this test' } } }

describe('a draft on the panel', () => {
  beforeEach(() => {
    resetPixiState()
    localStorage.clear()
  })
  afterEach(() => {
    document.body.innerHTML = ''
    vi.unstubAllGlobals()
  })

  it('has three staff-only routes', () => {
    const names = ['scenario-draft-setup', 'scenario-draft-try', 'scenario-draft-reference']
    for (const name of names) expect(routes.find((r) => r.name === name)?.meta?.roles).toEqual(STAFF)
  })

  it('set-up: saves the start built from the panel after a wire is added, then goes back to the editor', async () => {
    const { wrapper, router, calls } = await open(`/scenarios/${KEY}/draft/set-up`, (call) =>
      call.method === 'PUT' ? { body: draftBody(call.body as never) } : getDraft(call),
    )
    expect(wrapper.get('[data-testid="draft-bar"]').text()).toContain(
      `Setting up the start of ${scenarioFile.title}: what you leave here is where apprentices begin.`,
    )
    await wrapper.get('[data-testid="tab-wiring"]').trigger('click')
    await settle()
    wrapper.findComponent(PanelWiring).vm.$emit('addWire', 'drive.p24', 'runSwitch.a', 'brown')
    await settle()
    await wrapper.get('[data-testid="setup-save"]').trigger('click')
    await settle(3)
    const put = calls.find((c) => c.method === 'PUT')
    expect(put?.url).toContain(`/scenarios/${KEY}/draft`)
    const sent = (put!.body as { document: typeof scenarioFile }).document
    expect(sent.start.wires).toEqual([
      ...scenarioFile.start.wires,
      expect.objectContaining({ from: 'drive.p24', to: 'runSwitch.a', colour: 'brown' }),
    ])
    // The rest of the draft goes back as it was.
    expect(sent.objectives).toEqual(scenarioFile.objectives)
    expect(sent.start.power).toEqual(scenarioFile.start.power)
    expect(router.currentRoute.value.name).toBe('scenario-edit')
    wrapper.unmount()
  })

  it('shows the first-run safety notice, as the simulator does, until it is acknowledged', async () => {
    const notice = () => document.querySelector('[data-testid="safety-understood"]')
    const first = await open(`/scenarios/${KEY}/draft/set-up`, getDraft)
    await settle()
    expect(notice()).not.toBeNull()
    ;(notice() as HTMLElement).click()
    await settle()
    first.wrapper.unmount()
    document.body.innerHTML = ''

    const again = await open(`/scenarios/${KEY}/draft/reference`, getDraft)
    await settle()
    expect(notice()).toBeNull()
    again.wrapper.unmount()
  })

  it('set-up: refuses to save while a wire is being drawn, in words', async () => {
    const { wrapper, calls } = await open(`/scenarios/${KEY}/draft/set-up`, getDraft)
    wrapper.findComponent(PanelStage).vm.$emit('intent', { type: 'wire.start', from: 'drive.p24' })
    await wrapper.get('[data-testid="setup-save"]').trigger('click')
    await settle()
    expect(wrapper.get('[data-testid="setup-refusal"]').text()).toContain('A wire is being drawn')
    expect(calls.filter((c) => c.method !== 'GET')).toEqual([])
    wrapper.unmount()
  })

  it('try: grades the run on the page when finished and sends nothing, not even for an apprentice session', async () => {
    const { wrapper, calls } = await open(`/scenarios/${KEY}/draft/try`, getDraft, 'apprentice')
    expect(wrapper.get('[data-testid="draft-bar"]').text()).toContain(
      'Trying the draft: nothing is recorded or counted',
    )
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    await settle()
    await wrapper.get('[data-testid="draft-finish"]').trigger('click')
    await settle()
    expect(wrapper.get('[data-testid="draft-grade"]').text()).toMatch(/Graded: \d+ \/ 100 — not passed/)
    // Only the draft was read: no attempt, no live session, no copy in this browser.
    expect(calls.map((c) => `${c.method} ${new URL(c.url, 'http://x').pathname}`)).toEqual([
      `GET /api/scenarios/${KEY}/draft`,
    ])
    expect(localStorage.length).toBe(0)
    wrapper.unmount()
  })

  it('refuses a draft that fails its checks, with the problems in words and a way to the editor', async () => {
    const broken = { ...structuredClone(scenarioFile), objectives: [] }
    const { wrapper } = await open(`/scenarios/${KEY}/draft/try`, () => ({ body: draftBody(broken) }))
    for (let i = 0; i < 10 && !wrapper.find('[data-testid="draft-problems"]').exists(); i++) await settle(1)
    const text = wrapper.get('[data-testid="draft-problems"]').text()
    expect(text).toContain('This draft cannot be tried yet')
    expect(text).not.toContain('$.')
    expect(wrapper.find('[data-testid="draft-open-editor"]').exists()).toBe(true)
    wrapper.unmount()
  })

  it('reference: sends the run’s log and shows the objective it misses', async () => {
    const missed: ReferenceResult = {
      score: 40,
      passed: false,
      fullMarks: false,
      pointsEarned: 40,
      pointsPossible: 100,
      missed: ['Raise and lower tested at the panel'],
      safetyViolations: 1,
    }
    const { wrapper, calls } = await open(`/scenarios/${KEY}/draft/reference`, (call) =>
      call.method === 'PUT' ? { body: draftBody(structuredClone(scenarioFile), missed) } : getDraft(call),
    )
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    await settle()
    await wrapper.get('[data-testid="reference-save"]').trigger('click')
    await settle(3)
    const put = calls.find((c) => c.method === 'PUT')
    expect(put?.url).toContain(`/scenarios/${KEY}/draft/reference`)
    const events = (put!.body as { events: { type: string }[] }).events
    expect(events.map((e) => e.type)).toEqual(['lock.applied', 'attempt.ended'])
    const shown = wrapper.get('[data-testid="reference-result"]').text()
    expect(shown).toContain('Misses: Raise and lower tested at the panel')
    expect(shown).toContain('1 safety violation')
    expect(shown).toContain('Not full marks: 40 / 100')
    wrapper.unmount()
  })

  it('reference: says plainly when the draft is not ready (409)', async () => {
    const { wrapper } = await open(`/scenarios/${KEY}/draft/reference`, (call) =>
      call.method === 'PUT'
        ? {
            status: 409,
            body: { error: { code: 'draft_not_ready', message: 'The draft has problems to fix.' } },
          }
        : getDraft(call),
    )
    await wrapper.get('[data-testid="reference-save"]').trigger('click')
    await settle(3)
    const failure = wrapper.get('[data-testid="draft-failure"]').text()
    expect(failure).toContain('The reference solution was not saved')
    expect(failure).toContain('go back to the scenario')
    wrapper.unmount()
  })
})
