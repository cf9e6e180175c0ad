// The buttons on a pending invitation (resend, copy link, withdraw) and the roster dialog's "import the
// valid rows": each asks first where it undoes something, calls the server once, and says what happened.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import InvitationActions from '@/components/invitations/InvitationActions.vue'
import RosterUploadDialog from '@/components/cohorts/RosterUploadDialog.vue'
import { useNotify } from '@/composables/useNotify'
import { ids, stubFetch, testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

const LINK = { url: 'http://slipway.test/invitation?token=abc', expiresAt: '2030-01-08T10:00:00.000Z' }

function mountActions(overrides: Partial<Record<'resend' | 'link' | 'revoke', () => Promise<unknown>>> = {}) {
  const calls = {
    resend: vi.fn(overrides.resend ?? (async () => undefined)),
    link: vi.fn(overrides.link ?? (async () => LINK)),
    revoke: vi.fn(overrides.revoke ?? (async () => undefined)),
  }
  const { pinia, router, vuetify } = testPlugins()
  const wrapper = mount(InvitationActions, {
    props: { name: 'Rue Hollin', email: 'rue.hollin@bench.example', ...calls } as never,
    global: { plugins: [pinia, router, vuetify] },
    attachTo: document.body,
  })
  return { wrapper, calls }
}
/** jsdom has no clipboard; each test puts in the one it needs. */
const setClipboard = (clipboard: { writeText(text: string): Promise<void> }) =>
  Object.defineProperty(navigator, 'clipboard', { value: clipboard, configurable: true })
const dialogButton = (name: string) =>
  [...document.querySelectorAll<HTMLButtonElement>('.v-overlay--active button')].find(
    (b) => b.textContent?.trim() === name,
  )

describe('the actions on a pending invitation', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    useNotify().queue.value.splice(0)
    document.body.innerHTML = ''
  })

  it('resends at once and says so', async () => {
    const { wrapper, calls } = mountActions()
    await wrapper.get('[data-test="invitation-resend"]').trigger('click')
    await settle()
    expect(calls.resend).toHaveBeenCalledTimes(1)
    expect(useNotify().queue.value.at(-1)?.text).toBe('Invitation sent again to rue.hollin@bench.example')
    expect(wrapper.emitted('changed')).toHaveLength(1)
  })

  it('asks before withdrawing, and withdraws nothing when cancelled', async () => {
    const { wrapper, calls } = mountActions()
    await wrapper.get('[data-test="invitation-revoke"]').trigger('click')
    await settle()
    expect(document.body.textContent).toContain('Withdraw this invitation?')
    dialogButton('Cancel')!.click()
    await settle()
    expect(calls.revoke).not.toHaveBeenCalled()
    await wrapper.get('[data-test="invitation-revoke"]').trigger('click')
    await settle()
    dialogButton('Withdraw')!.click()
    await settle()
    expect(calls.revoke).toHaveBeenCalledTimes(1)
    expect(wrapper.emitted('changed')).toHaveLength(1)
  })

  it('asks before making a new link, then puts it on the clipboard and shows it', async () => {
    const writeText = vi.fn(async () => undefined)
    setClipboard({ writeText })
    const { wrapper, calls } = mountActions()
    await wrapper.get('[data-test="invitation-copy"]').trigger('click')
    await settle()
    expect(document.body.textContent).toContain('The link in the invitation e-mail stops working')
    expect(calls.link).not.toHaveBeenCalled()
    dialogButton('Make and copy the link')!.click()
    await settle()
    expect(calls.link).toHaveBeenCalledTimes(1)
    expect(writeText).toHaveBeenCalledWith(LINK.url)
    expect(document.body.textContent).toContain('The link for Rue Hollin is on your clipboard.')
    const field = document.querySelector<HTMLInputElement>('[data-test="invitation-link"] input')!
    expect(field.value).toBe(LINK.url)
    expect(wrapper.emitted('changed')).toBeUndefined() // the list reloads once the link has been seen
    dialogButton('Done')!.click()
    await settle()
    expect(wrapper.emitted('changed')).toHaveLength(1)
  })

  it('shows the link to copy by hand when the browser refuses the clipboard', async () => {
    setClipboard({ writeText: async () => Promise.reject(new Error('no')) })
    const { wrapper } = mountActions()
    await wrapper.get('[data-test="invitation-copy"]').trigger('click')
    await settle()
    dialogButton('Make and copy the link')!.click()
    await settle()
    expect(document.body.textContent).toContain('Copy the link below')
  })

  it('says why when the server refuses', async () => {
    const { ApiError } = await import('@/api/errors')
    const { wrapper } = mountActions({
      resend: async () => {
        throw new ApiError(404, 'not_found', 'Pending invitation not found')
      },
    })
    await wrapper.get('[data-test="invitation-resend"]').trigger('click')
    await settle()
    expect(wrapper.get('[role="alert"]').text()).toContain('Pending invitation not found')
    expect(wrapper.emitted('changed')).toBeUndefined()
  })
})

describe('the roster dialog', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  async function mountWithFile(csv: string) {
    const { pinia, router, vuetify } = testPlugins()
    const wrapper = mount(RosterUploadDialog, {
      props: { modelValue: true, cohortId: ids.cohort },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    await settle()
    const input = document.querySelector<HTMLInputElement>('[data-testid="roster-file"] input[type="file"]')!
    const file = new File([csv], 'roster.csv', { type: 'text/csv' })
    Object.defineProperty(input, 'files', { value: [file] })
    input.dispatchEvent(new Event('change'))
    await settle()
    return wrapper
  }
  const button = (testId: string) => document.querySelector<HTMLButtonElement>(`[data-testid="${testId}"]`)

  it('names the size limit of a file', async () => {
    await mountWithFile('name,email\n')
    expect(document.querySelector('[data-testid="roster-limits"]')!.textContent).toContain('Up to 500 rows')
  })

  it('offers to import the valid rows when some have problems, and sends them with rows=valid', async () => {
    const calls = stubFetch(() => ({
      status: 201,
      body: {
        items: [{ outcome: 'invited', email: 'wren@bench.example', invitation: null }],
        skipped: [{ row: 3, field: 'email', message: 'Must be an e-mail address' }],
      },
    }))
    const wrapper = await mountWithFile('name,email\nWren Maddox,wren@bench.example\nNo Address,nope\n')
    expect(button('roster-import-all')!.disabled).toBe(true)
    expect(button('roster-import-valid')!.textContent).toContain('Import the valid rows (1)')
    button('roster-import-valid')!.click()
    await settle()
    expect(calls).toHaveLength(1)
    expect(calls[0]!.url).toContain(`/api/cohorts/${ids.cohort}/invitations/roster?rows=valid`)
    expect(wrapper.emitted('imported')![0]).toEqual([
      [{ outcome: 'invited', email: 'wren@bench.example', invitation: null }],
      1,
    ])
  })

  it('offers only the all-rows import when every row is fine', async () => {
    await mountWithFile('name,email\nWren Maddox,wren@bench.example\n')
    expect(button('roster-import-valid')).toBeNull()
    expect(button('roster-import-all')!.disabled).toBe(false)
    expect(button('roster-import-all')!.textContent).toContain('Invite 1 apprentice')
  })
})
