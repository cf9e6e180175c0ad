// The scenario editor as an author meets it: forms only, the scenario's own parts offered as choices,
// problems shown once a field is touched, a draft saved with the store's calls (mocked here).
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils'
import { VAutocomplete, VSelect, VTextField } from 'vuetify/components'
import deadControl from '../../../scenarios/dead-control-circuit.json'
import { checkScenario } from '@shared/scenario'
import ScenarioEditorView from '@/views/ScenarioEditorView.vue'
import { useScenariosStore } from '@/stores/scenarios'
import { ApiError } from '@/api/errors'
import { testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

function draftReply(key: string, document: Record<string, unknown>, nextVersion = 1) {
  return {
    key,
    title: String(document.title ?? ''),
    document,
    baseVersion: nextVersion > 1 ? nextVersion - 1 : null,
    nextVersion,
    createdAt: '2026-12-01T09:00:00.000Z',
    updatedAt: '2026-12-01T09:00:00.000Z',
    updatedByName: 'Wren Maddox',
    problems: [],
    reference: null,
    publishable: false,
  }
}

type Store = ReturnType<typeof useScenariosStore>
/** A Vuetify field as the tests read it: its props by name. */
type Wrapped = VueWrapper & { props(name: string): unknown }

async function mountEditor(path: string, arrange: (store: Store) => void = () => {}) {
  const routes = [
    { path: '/scenarios/new', name: 'scenario-new', component: ScenarioEditorView },
    { path: '/scenarios/:id/edit', name: 'scenario-edit', component: ScenarioEditorView },
  ]
  const { router, pinia, vuetify } = testPlugins(routes)
  const store = useScenariosStore()
  store.getDraft = vi.fn(async (key: string) =>
    draftReply(key, structuredClone(deadControl), 3),
  ) as Store['getDraft']
  store.startDraft = vi.fn() as unknown as Store['startDraft']
  store.saveDraft = vi.fn(async (key: string, document: Record<string, unknown>) =>
    draftReply(key, document, 3),
  ) as Store['saveDraft']
  store.createDraft = vi.fn(async (key: string, document: Record<string, unknown>) =>
    draftReply(key, document),
  ) as Store['createDraft']
  arrange(store)
  await router.push(path)
  const wrapper = mount(
    { template: '<router-view />' },
    {
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    },
  )
  await settle()
  return { wrapper, router, store }
}

function selectLabelled(wrapper: VueWrapper, label: string): Wrapped[] {
  const all = [
    ...wrapper.findAllComponents(VSelect),
    ...wrapper.findAllComponents(VAutocomplete),
  ] as unknown as Wrapped[]
  const found = all.filter((s) => s.props('label') === label)
  return found
}
const field = (wrapper: VueWrapper, label: string) =>
  (wrapper.findAllComponents(VTextField) as unknown as Wrapped[]).filter((f) => f.props('label') === label)

describe('the scenario editor', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  it('adds a device with a label and keeps its id off the screen', async () => {
    const { wrapper, store, router } = await mountEditor('/scenarios/new')
    await wrapper.get('[data-testid="add-device"]').trigger('click')
    await wrapper.get('[data-testid="device-label"] input').setValue('Fan start')
    await settle()
    expect(wrapper.get('[data-testid="device-item"]').text()).toContain('Fan start')
    expect(wrapper.get('[data-testid="device-item"]').text()).toContain('Push button')
    expect(wrapper.text()).not.toContain('fanStart')
    await wrapper.get('[data-testid="story-title"] input').setValue('Night shift pump')
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(store.createDraft).toHaveBeenCalledTimes(1)
    const [key, document] = vi.mocked(store.createDraft).mock.calls[0]!
    expect(key).toBe('night-shift-pump')
    // The first save moves the form to the draft's address without asking about unsaved changes.
    expect(router.currentRoute.value.path).toBe('/scenarios/night-shift-pump/edit')
    expect(window.document.body.textContent).not.toContain('Leave without saving?')
    expect((document.start as { devices: unknown[] }).devices).toEqual([
      { id: 'fanStart', kind: 'pushbutton', label: 'Fan start', contact: 'NO' },
    ])
  })

  it('offers only the scenario’s own wires as the target of a broken-wire fault', async () => {
    const { wrapper } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const wireSelects = selectLabelled(wrapper, 'Which wire')
    expect(wireSelects.length).toBe(1) // the shipped broken-wire fault
    const items = wireSelects[0]!.props('items') as { value: string; title: string }[]
    expect(items.map((i) => i.value)).toEqual(deadControl.start.wires.map((w) => w.id))
    // In words: the wire's marker and where it runs, never its id.
    expect(items[1]!.title).toBe('W2 (blue) from +24 to Fan run / stop terminal 13')
    for (const item of items) expect(item.title).not.toMatch(/wRun|wCom|drive\./)
    // A new fault of the same kind is offered the same wires.
    await selectLabelled(wrapper, 'Add a fault')[0]!.setValue('brokenWire')
    await settle()
    const again = selectLabelled(wrapper, 'Which wire')
    expect(again.length).toBe(2)
    expect((again[1]!.props('items') as { value: string }[]).map((i) => i.value)).toEqual(
      deadControl.start.wires.map((w) => w.id),
    )
  })

  it('adds an objective from the catalogue whose value field follows the chosen setting', async () => {
    const { wrapper } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const before = wrapper.findAll('[data-testid="objective-item"]').length
    await selectLabelled(wrapper, 'Add an objective')[0]!.setValue('settingEquals')
    await settle()
    const items = wrapper.findAll('[data-testid="objective-item"]')
    expect(items.length).toBe(before + 1)
    // The new objective opens at once.
    expect(items[before]!.text()).toContain('Drive setting')
    const pickers = (wrapper.findAllComponents(VAutocomplete) as unknown as Wrapped[]).filter(
      (p) => p.props('label') === 'Setting',
    )
    const picker = pickers[pickers.length - 1]!
    const choices = picker.props('items') as { value: string; title: string }[]
    expect(choices.find((c) => c.value === 'speed.max')?.title).toBe('Maximum speed')
    await picker.setValue('speed.max')
    await settle()
    const valueField = field(wrapper, 'Value').at(-1)!
    expect(valueField.props('suffix')).toBe('Hz')
    expect(valueField.props('hint')).toBe('1–120 Hz, in steps of 0.1 Hz')
    expect(valueField.props('modelValue')).toBe(50) // the setting's default
    // A setting with options gets a list of them instead.
    await picker.setValue('control.source')
    await settle()
    const optionSelect = selectLabelled(wrapper, 'Value').at(-1)!
    const options = optionSelect.props('items') as { title: string }[]
    expect(options.length).toBeGreaterThan(1)
    for (const o of options) expect(o.title).toMatch(/^[A-Z]/)
  })

  it('shows a field’s problem only once the field is touched', async () => {
    const { wrapper } = await mountEditor('/scenarios/new')
    const title = field(wrapper, 'Title')[0]!
    expect(title.props('errorMessages')).toEqual([])
    expect(wrapper.get('[data-testid="scenario-checker"]').text()).toContain('Still to fill in')
    await wrapper.get('[data-testid="story-title"] input').setValue('ab')
    await wrapper.get('[data-testid="story-title"] input').trigger('blur')
    await settle()
    expect(field(wrapper, 'Title')[0]!.props('errorMessages')).toEqual(['Write at least 3 characters'])
    // Other fields stay quiet until touched.
    expect(field(wrapper, 'Machine')[0]!.props('errorMessages')).toEqual([])
    expect(wrapper.text()).not.toMatch(/\$\.|\[\d+\]/)
  })

  it('says on the objectives themselves, after a save attempt, that there must be at least one', async () => {
    const { wrapper } = await mountEditor('/scenarios/new')
    expect(wrapper.find('[data-testid="objectives-problem"]').exists()).toBe(false)
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(wrapper.get('[data-testid="objectives-problem"]').text()).toBe('Objectives: add at least one')
  })

  it('saves the whole document as a draft, stays on the page and says so; the document passes the checks', async () => {
    const { wrapper, store, router } = await mountEditor('/scenarios/dead-control-circuit/edit')
    await wrapper.get('[data-testid="story-title"] input').setValue('The cold-store fan will not start again')
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(store.saveDraft).toHaveBeenCalledTimes(1)
    const [key, document] = vi.mocked(store.saveDraft).mock.calls[0]!
    expect(key).toBe('dead-control-circuit')
    const check = checkScenario(document)
    expect(check.ok ? [] : check.problems).toEqual([])
    expect(document.title).toBe('The cold-store fan will not start again')
    expect(document.version).toBe(3)
    expect(wrapper.get('[data-testid="saved"]').text()).toContain('Saved')
    expect(router.currentRoute.value.path).toBe('/scenarios/dead-control-circuit/edit')
  })

  it('starts a draft from the latest version when the key has none', async () => {
    const { store } = await mountEditor('/scenarios/dead-control-circuit/edit', (s) => {
      s.getDraft = vi.fn(async () => {
        throw new ApiError(404, 'not_found', 'No draft')
      }) as Store['getDraft']
      s.startDraft = vi.fn(async (key: string) =>
        draftReply(key, structuredClone(deadControl), 3),
      ) as Store['startDraft']
    })
    expect(store.startDraft).toHaveBeenCalledWith('dead-control-circuit')
  })

  it('asks before leaving with unsaved changes', async () => {
    const { wrapper, router } = await mountEditor('/scenarios/dead-control-circuit/edit')
    await wrapper.get('[data-testid="story-title"] input').setValue('Changed')
    await router.push('/scenarios').catch(() => {})
    await settle()
    expect(router.currentRoute.value.path).toBe('/scenarios/dead-control-circuit/edit')
    expect(document.body.textContent).toContain('Leave without saving?')
  })
})
