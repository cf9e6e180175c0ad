// The scenario editor as an author meets it: forms only, the scenario's own parts offered as choices,
// problems shown once a field is touched, a draft saved with the store's calls (mocked here).
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount, type VueWrapper } from '@vue/test-utils'
import { VAutocomplete, VSelect, VTextField } from 'vuetify/components'
import deadControl from '../../../scenarios/dead-control-circuit.json'
import fanRampOrCoast from '../../../scenarios/fan-ramp-or-coast.json'
import { checkScenario } from '@shared/scenario'
import ScenarioEditorView from '@/views/ScenarioEditorView.vue'
import { useScenariosStore } from '@/stores/scenarios'
import { ApiError } from '@/api/errors'
import { testPlugins } from './helpers'
import { SHIPPED_SCENARIOS } from './shippedScenarios'

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

  it('undoes and redoes a change to the document from the save bar', async () => {
    const { wrapper } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const devices = () => wrapper.findAll('[data-testid="device-item"]').length
    const before = devices()
    expect(wrapper.get('[data-testid="undo"]').attributes('disabled')).toBeDefined()
    await wrapper.get('[data-testid="add-device"]').trigger('click')
    await settle()
    expect(devices()).toBe(before + 1)
    await wrapper.get('[data-testid="undo"]').trigger('click')
    await settle()
    expect(devices()).toBe(before)
    // Back where the draft was loaded: nothing unsaved.
    expect(wrapper.text()).not.toContain('Unsaved changes')
    await wrapper.get('[data-testid="redo"]').trigger('click')
    await settle()
    expect(devices()).toBe(before + 1)
    expect(wrapper.text()).toContain('Unsaved changes')
  })

  it('proves dead on the usual pairs, or on pairs the author ticks, phase to earth included', async () => {
    const { wrapper, store } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const item = wrapper
      .findAll('[data-testid="objective-item"]')
      .find((i) => i.text().includes('Absence of voltage proved'))!
    await item.get('.v-expansion-panel-title').trigger('click')
    await settle()
    const pairs = () => item.get('[data-testid="probe-pairs"]')
    expect(pairs().text()).toContain('The usual pairs: L1 – L2, L2 – L3, L1 – L3, DC+ – DC−')
    const radios = pairs().findAll('input[type="radio"]')
    await radios[1]!.setValue(true)
    await settle()
    // Choosing starts from the usual pairs, ticked; phase to earth is offered beside them.
    const box = (label: string) =>
      pairs()
        .findAll('.v-checkbox')
        .find((c) => c.text() === label)!
        .get('input')
    expect((box('L1 – L2').element as HTMLInputElement).checked).toBe(true)
    expect((box('L1 – PE').element as HTMLInputElement).checked).toBe(false)
    await box('L1 – PE').setValue(true)
    await box('L2 – L3').setValue(false)
    await settle()
    await wrapper.get('form').trigger('submit')
    await settle()
    const [, document] = vi.mocked(store.saveDraft).mock.calls[0]!
    const saved = (document.objectives as { kind: string; pairs?: string[][] }[]).find(
      (o) => o.kind === 'absenceOfVoltageProved',
    )!
    expect(saved.pairs).toEqual([
      ['drive.l1', 'drive.l2'],
      ['drive.l1', 'drive.l3'],
      ['drive.l1', 'drive.pe'],
      ['drive.dcp', 'drive.dcn'],
    ])
    expect(wrapper.text()).not.toContain('drive.')
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

  it('gives back each shipped scenario unchanged when it is opened and saved without edits', async () => {
    for (const scenario of SHIPPED_SCENARIOS) {
      const { wrapper, store } = await mountEditor(`/scenarios/${String(scenario.id)}/edit`, (s) => {
        s.getDraft = vi.fn(async (key: string) =>
          draftReply(key, structuredClone(scenario), Number(scenario.version)),
        ) as Store['getDraft']
      })
      expect(wrapper.text()).not.toContain('Unsaved changes')
      await wrapper.get('form').trigger('submit')
      await settle()
      const [, saved] = vi.mocked(store.saveDraft).mock.calls[0]!
      expect(JSON.parse(JSON.stringify(saved)), String(scenario.id)).toStrictEqual(scenario)
      wrapper.unmount()
      document.body.innerHTML = ''
    }
  }, 60_000)

  it('names the machine once for a new scenario and keeps a short name the author gives it', async () => {
    const { wrapper, store } = await mountEditor('/scenarios/new')
    await wrapper.get('[data-testid="story-machine"] input').setValue('Kiln fan KF-1')
    await settle()
    expect(field(wrapper, "Machine's name")[0]!.props('modelValue')).toBe('Kiln fan KF-1')
    await wrapper.get('[data-testid="machine-name"] input').setValue('Kiln fan')
    await wrapper.get('[data-testid="story-machine"] input').setValue('Kiln fan KF-1 (belt drive)')
    await wrapper.get('[data-testid="story-title"] input').setValue('Kiln fan restart')
    await wrapper.get('form').trigger('submit')
    await settle()
    const [, document] = vi.mocked(store.createDraft).mock.calls[0]!
    expect((document.site as { machine: string }).machine).toBe('Kiln fan KF-1 (belt drive)')
    expect((document.start as { machine: unknown }).machine).toEqual({ name: 'Kiln fan' })
  })

  it('leaves a shipped scenario’s shorter machine name alone when the story’s machine changes', async () => {
    const { wrapper, store } = await mountEditor('/scenarios/fan-ramp-or-coast/edit', (s) => {
      s.getDraft = vi.fn(async (key: string) =>
        draftReply(key, structuredClone(fanRampOrCoast), 3),
      ) as Store['getDraft']
    })
    expect(field(wrapper, "Machine's name")[0]!.props('modelValue')).toBe('Kiln exhaust fan EF-9')
    await wrapper
      .get('[data-testid="story-machine"] input')
      .setValue('Kiln exhaust fan EF-9 (heavy impeller)')
    await wrapper.get('form').trigger('submit')
    await settle()
    const [, document] = vi.mocked(store.saveDraft).mock.calls[0]!
    expect((document.start as { machine: { name: string } }).machine.name).toBe('Kiln exhaust fan EF-9')
  })

  it('edits the motor nameplate with units and bounds, and can fall back to the bench motor', async () => {
    const { wrapper, store } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const plate = wrapper.get('[data-testid="motor-nameplate"]')
    expect(field(wrapper, 'Rated speed')[0]!.props('suffix')).toBe('rpm')
    expect(field(wrapper, 'Rated voltage')[0]!.props('hint')).toBe('At least 100 V, at most 690 V')
    expect(field(wrapper, 'Rated output')[0]!.props('suffix')).toBe('kW')
    const duty = selectLabelled(wrapper, 'Duty')[0]!
    expect((duty.props('items') as { title: string }[])[0]!.title).toBe('S1 (continuous)')
    expect(plate.text()).not.toMatch(/ratedRpm|efficiencyPercent|\bdelta\b/)

    // A speed no 50 Hz motor runs at is refused in words on the field.
    const speed = plate.findAll('input').find((i) => (i.element as HTMLInputElement).value === '1440')!
    await speed.setValue('1600')
    await speed.trigger('blur')
    await settle()
    expect(field(wrapper, 'Rated speed')[0]!.props('errorMessages')).toEqual([
      expect.stringContaining('must be a little below a synchronous speed'),
    ])
    await speed.setValue('1450')
    await settle()

    // The bench motor: no plate in the document, its figures from the drive's settings shown in words.
    await wrapper.get('[data-testid="motor-choice"] input[value="bench"]').setValue(true)
    await settle()
    expect(wrapper.find('[data-testid="motor-nameplate"]').exists()).toBe(false)
    expect(wrapper.get('[data-testid="bench-motor"]').text()).toMatch(/400 V star, 50 Hz, [\d.]+ kW/)
    await wrapper.get('form').trigger('submit')
    await settle()
    const [, onBench] = vi.mocked(store.saveDraft).mock.calls[0]!
    expect('motor' in (onBench.start as object)).toBe(false)

    // Choosing the plate again brings back the author's figures.
    await wrapper.get('[data-testid="motor-choice"] input[value="own"]').setValue(true)
    await wrapper.get('form').trigger('submit')
    await settle()
    const [, withPlate] = vi.mocked(store.saveDraft).mock.calls[1]!
    expect((withPlate.start as { motor: unknown }).motor).toEqual({
      ...deadControl.start.motor,
      ratedRpm: 1450,
    })
    const check = checkScenario(withPlate)
    expect(check.ok ? [] : check.problems).toEqual([])
  })

  it('starts an own nameplate that agrees with the drive’s settings, leaving only the serial to invent', async () => {
    const { wrapper, store } = await mountEditor('/scenarios/new')
    expect(wrapper.get('[data-testid="motor-choice"] input[value="bench"]').element).toHaveProperty(
      'checked',
      true,
    )
    await wrapper.get('[data-testid="motor-choice"] input[value="own"]').setValue(true)
    await wrapper.get('[data-testid="story-title"] input').setValue('Night shift pump')
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(field(wrapper, 'Serial number')[0]!.props('errorMessages')).toEqual(['Fill this in'])
    const [, document] = vi.mocked(store.createDraft).mock.calls[0]!
    const check = checkScenario(document)
    const motorProblems = check.ok ? [] : check.problems.filter((p) => p.path.startsWith('$.start.motor'))
    expect(motorProblems.map((p) => p.path)).toEqual(['$.start.motor.serial'])
  })

  it('asks before a change of kind leaves wires on terminals the new kind lacks, naming them', async () => {
    const { wrapper } = await mountEditor('/scenarios/dead-control-circuit/edit')
    const kind = () => selectLabelled(wrapper, 'Kind')[0]!
    await kind().setValue('potentiometer')
    await settle()
    const dialog = () => document.body.querySelector('[role="alertdialog"]')
    expect(dialog()?.textContent).toContain('Make Fan run / stop a potentiometer?')
    const listed = [...document.body.querySelectorAll('[data-testid="kind-change-wires"] li')].map(
      (li) => li.textContent,
    )
    expect(listed).toEqual([
      'W2 (blue) from +24 to Fan run / stop terminal 13',
      'W3 (blue) from Fan run / stop terminal 14 to DI1',
    ])
    const button = (text: string) =>
      [...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === text)!
    button('Cancel').click()
    await settle()
    expect(kind().props('modelValue')).toBe('selector')

    await kind().setValue('potentiometer')
    await settle()
    button('Change it').click()
    await settle()
    expect(kind().props('modelValue')).toBe('potentiometer')
  })

  it('changes kind at once when every wire keeps its terminal', async () => {
    const { wrapper } = await mountEditor('/scenarios/dead-control-circuit/edit')
    await selectLabelled(wrapper, 'Kind')[0]!.setValue('pushbutton')
    await settle()
    expect(document.body.querySelector('[role="alertdialog"]')).toBeNull()
    expect(selectLabelled(wrapper, 'Kind')[0]!.props('modelValue')).toBe('pushbutton')
    expect(wrapper.get('[data-testid="device-item"]').text()).toContain('Push button')
  })
})
