// Main forms mounted as a user meets them: validation messages, server errors, where they lead.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import SignInView from '@/views/SignInView.vue'
import InviteDialog from '@/components/cohorts/InviteDialog.vue'
import { ApiError } from '@/api/errors'
import { sessionBody, stubFetch, testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

describe('the sign-in page', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  async function mountSignIn(path = '/sign-in') {
    const { router, pinia, vuetify } = testPlugins([{ path: '/sign-in', component: SignInView }])
    await router.push(path)
    const wrapper = mount(SignInView, {
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    return { wrapper, router }
  }

  it('says what is missing when submitted empty, and sends nothing', async () => {
    const calls = stubFetch(() => ({ body: sessionBody() }))
    const { wrapper } = await mountSignIn()
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.text()).toContain('Must be an e-mail address')
    expect(wrapper.text()).toContain('Enter your password')
    expect(calls).toHaveLength(0)
  })

  it('shows the server’s message for wrong credentials', async () => {
    stubFetch(() => ({
      status: 401,
      body: { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password' } },
    }))
    const { wrapper } = await mountSignIn()
    await wrapper.find('input[type="email"]').setValue('wren.maddox@bench.example')
    await wrapper.find('input[type="password"]').setValue('not the password')
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.get('[role="alert"]').text()).toContain('Wrong e-mail or password')
  })

  it('brings the user back to the page they asked for', async () => {
    stubFetch(() => ({ body: sessionBody('instructor') }))
    const { wrapper, router } = await mountSignIn('/sign-in?redirect=/teach/gradebook%3Fcohort%3D1')
    await wrapper.find('input[type="email"]').setValue('wren.maddox@bench.example')
    await wrapper.find('input[type="password"]').setValue('a long pass phrase')
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(router.currentRoute.value.fullPath).toBe('/teach/gradebook?cohort=1')
  })

  it('opens the role’s start page when there is nowhere to go back to', async () => {
    stubFetch(() => ({ body: sessionBody('apprentice') }))
    const { wrapper, router } = await mountSignIn()
    await wrapper.find('input[type="email"]').setValue('wren.maddox@bench.example')
    await wrapper.find('input[type="password"]').setValue('a long pass phrase')
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(router.currentRoute.value.path).toBe('/learn')
  })
})

describe('the invitation dialog', () => {
  afterEach(() => {
    document.body.innerHTML = ''
  })

  function mountInvite(send: () => Promise<never>) {
    const { pinia, router, vuetify } = testPlugins()
    return mount(InviteDialog, {
      props: { modelValue: true, title: 'Invite an apprentice', send },
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
  }

  it('checks name and e-mail with the shared schema before sending', async () => {
    const send = vi.fn()
    mountInvite(send)
    await settle()
    const form = document.body.querySelector('form')!
    form.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(document.body.textContent).toContain('Enter a name')
    expect(document.body.textContent).toContain('Must be an e-mail address')
    expect(send).not.toHaveBeenCalled()
  })

  it('puts the server’s field message under the field', async () => {
    const send = vi.fn(async () => {
      throw new ApiError(409, 'email_taken', 'That address already has an account', {
        fields: { email: ['Already an instructor account'] },
      })
    })
    mountInvite(send)
    await settle()
    const inputs = document.body.querySelectorAll('input')
    for (const [input, value] of [
      [inputs[0], 'Tam Ode'],
      [inputs[1], 'tam.ode@bench.example'],
    ] as const) {
      input.value = value
      input.dispatchEvent(new Event('input'))
    }
    await settle()
    document.body.querySelector('form')!.dispatchEvent(new Event('submit', { cancelable: true }))
    await settle()
    expect(send).toHaveBeenCalledWith({ name: 'Tam Ode', email: 'tam.ode@bench.example' })
    expect(document.body.textContent).toContain('That address already has an account')
    expect(document.body.textContent).toContain('Already an instructor account')
  })
})
