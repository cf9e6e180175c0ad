// The records on the client: the instructor's sign-off dialog (note, confirmation, what is sent), the
// withdrawal of a sign-off (reason, confirmation) and the as-wired schematic drawn from an attempt's log.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import type { TrainingOutcome } from '@shared/api'
import { scenarioSchema } from '@shared/scenario'
import SignOffDialog from '@/components/records/SignOffDialog.vue'
import TrainingOutcomes from '@/components/records/TrainingOutcomes.vue'
import WithdrawSignOffDialog from '@/components/records/WithdrawSignOffDialog.vue'
import { asWiredSchematic } from '@/components/records/asWired'
import twoWire from '../../../scenarios/two-wire-run-stop.json'
import reference from '../../fixtures/attempts/two-wire-run-stop--reference.json'
import { ids, stubFetch, testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

const outcome: TrainingOutcome = {
  scenarioKey: 'two-wire-run-stop',
  scenarioTitle: 'Two-wire run/stop',
  outcome: 'Wire a maintained contact to a digital input',
  shownBy: null,
  signOff: null,
  withdrawnSignOffs: [],
}

function typeNote(text: string) {
  const area = document.body.querySelector('textarea')!
  area.value = text
  area.dispatchEvent(new Event('input'))
}
const button = (label: string) =>
  [...document.body.querySelectorAll('button')].find((b) => b.textContent?.trim() === label)!

describe('the sign-off dialog', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  function mountDialog() {
    const { pinia, router, vuetify } = testPlugins()
    return mount(SignOffDialog, {
      props: {
        modelValue: true,
        apprenticeId: ids.user,
        apprenticeName: 'Wren Maddox',
        cohortId: ids.cohort,
        outcome,
      },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
  }

  it('asks for a note and sends nothing without one', async () => {
    const calls = stubFetch(() => ({ status: 201, body: {} }))
    mountDialog()
    await settle()
    expect(document.body.textContent).toContain('No attempt has passed this exercise yet')
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(document.body.textContent).toContain('Write a note: what you saw the apprentice do')
    expect(calls).toHaveLength(0)
  })

  it('shows the note for confirmation, then signs off in the cohort with the note (the server trims it)', async () => {
    const calls = stubFetch(() => ({
      status: 201,
      body: {
        id: ids.assignment,
        cohortId: ids.cohort,
        byName: 'Tam Ode',
        at: '2026-12-02T10:00:00Z',
        note: 'Seen.',
      },
    }))
    const wrapper = mountDialog()
    await settle()
    typeNote('  Locked off and proved dead unprompted.  ')
    await settle()
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(document.body.textContent).toContain('Sign off this outcome?')
    expect(document.body.textContent).toContain('printed on Wren Maddox’s training record')
    expect(calls).toHaveLength(0)
    button('Sign off').click()
    await settle()
    expect(calls).toHaveLength(1)
    expect(calls[0]!.method).toBe('POST')
    expect(calls[0]!.url).toContain(`/api/apprentices/${ids.user}/sign-offs`)
    expect(calls[0]!.body).toEqual({
      cohortId: ids.cohort,
      scenarioKey: 'two-wire-run-stop',
      outcome: 'Wire a maintained contact to a digital input',
      note: '  Locked off and proved dead unprompted.  ',
    })
    expect(wrapper.emitted('signed')).toHaveLength(1)
    expect(wrapper.emitted('update:modelValue')?.at(-1)).toEqual([false])
  })

  it('keeps the dialog open with the server’s reason when the sign-off is refused', async () => {
    stubFetch(() => ({
      status: 409,
      body: {
        error: { code: 'conflict', message: 'This outcome is already signed off for this apprentice' },
      },
    }))
    const wrapper = mountDialog()
    await settle()
    typeNote('Seen twice.')
    await settle()
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    button('Sign off').click()
    await settle()
    expect(document.body.textContent).toContain('This outcome is already signed off for this apprentice')
    expect(wrapper.emitted('signed')).toBeUndefined()
  })
})

describe('withdrawing a sign-off', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  const signed: TrainingOutcome = {
    ...outcome,
    signOff: {
      id: ids.assignment,
      cohortId: ids.cohort,
      byName: 'Tam Ode',
      at: '2026-12-01T10:00:00Z',
      note: 'Seen.',
    },
  }

  function mountDialog() {
    const { pinia, router, vuetify } = testPlugins()
    return mount(WithdrawSignOffDialog, {
      props: { modelValue: true, apprenticeName: 'Wren Maddox', outcome: signed },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
  }

  it('asks for a reason, then for confirmation, and only then withdraws', async () => {
    const calls = stubFetch(() => ({
      status: 201,
      body: {
        ...signed.signOff,
        withdrawnByName: 'Tam Ode',
        withdrawnAt: '2026-12-02T10:00:00Z',
        reason: 'Wrong apprentice.',
      },
    }))
    const wrapper = mountDialog()
    await settle()
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(document.body.textContent).toContain('Say why the sign-off is withdrawn')
    typeNote('Wrong apprentice.')
    await settle()
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(document.body.textContent).toContain('Withdraw this sign-off?')
    expect(document.body.textContent).toContain('printed with its reason on Wren Maddox’s training record')
    expect(calls).toHaveLength(0)
    button('Withdraw sign-off').click()
    await settle()
    expect(calls).toHaveLength(1)
    expect(calls[0]!.method).toBe('POST')
    expect(calls[0]!.url).toContain(`/api/sign-offs/${ids.assignment}/withdrawal`)
    expect(calls[0]!.body).toEqual({ reason: 'Wrong apprentice.' })
    expect(wrapper.emitted('withdrawn')).toHaveLength(1)
    expect(wrapper.emitted('update:modelValue')?.at(-1)).toEqual([false])
  })

  it('offers withdrawal only on a signed-off outcome, and shows a withdrawn one with its reason', async () => {
    const { pinia, router, vuetify } = testPlugins()
    const wrapper = mount(TrainingOutcomes, {
      props: {
        signable: true,
        outcomes: [
          signed,
          {
            ...outcome,
            outcome: 'Prove the circuit dead',
            withdrawnSignOffs: [
              {
                ...signed.signOff!,
                id: ids.cohort,
                withdrawnByName: 'Tam Ode',
                withdrawnAt: '2026-12-02T10:00:00Z',
                reason: 'Wrong apprentice.',
              },
            ],
          },
        ],
      },
      global: { plugins: [pinia, router, vuetify] },
    })
    const withdrawButtons = wrapper.findAll('button').filter((b) => b.text() === 'Withdraw sign-off')
    expect(withdrawButtons).toHaveLength(1)
    await withdrawButtons[0]!.trigger('click')
    expect(wrapper.emitted('withdraw')?.[0]?.[0]).toMatchObject({ outcome: signed.outcome })
    expect(wrapper.get('[data-testid="withdrawn-sign-off"]').text()).toMatch(
      /Sign-off by Tam Ode \(.+\) withdrawn by Tam Ode, .+: “Wrong apprentice\.”/,
    )
  })
})

describe('the as-wired schematic on the attempt pages', () => {
  it('draws every wire of the attempt’s final wiring, with its number', () => {
    const scenario = scenarioSchema.parse(twoWire)
    const drawing = asWiredSchematic(scenario, reference.events as never)
    const added = new Set<string>()
    for (const e of reference.events as { type: string; id?: string }[]) {
      if (e.type === 'wire.added') added.add(e.id!)
      if (e.type === 'wire.removed') added.delete(e.id!)
    }
    expect(drawing.wires).toBe(added.size)
    expect(drawing.svg).toMatch(/^<svg /)
    for (let n = 1; n <= added.size; n++) expect(drawing.svg).toContain(`W${n}`)
  })
})
