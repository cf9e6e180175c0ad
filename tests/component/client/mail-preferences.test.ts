// The profile's e-mail choices: the switch a role needs, saved as turned, put back with the reason on failure.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import MailPreferencesCard from '@/components/profile/MailPreferencesCard.vue'
import { stubFetch, testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

function mountCard(role: 'apprentice' | 'instructor') {
  const { pinia, router, vuetify } = testPlugins()
  return mount(MailPreferencesCard, {
    props: { role },
    global: { plugins: [pinia, router, vuetify] },
    attachTo: document.body,
  })
}

const switchInput = (wrapper: ReturnType<typeof mountCard>, key: string) =>
  wrapper.get(`[data-test="mail-${key}"] input[type="checkbox"]`)

describe('the e-mail choices on the profile', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('offers an apprentice the due-date reminders, on, and saves turning them off', async () => {
    const calls = stubFetch((call) =>
      call.method === 'PATCH'
        ? { body: { dueReminders: false, dailyDigest: true } }
        : { body: { dueReminders: true, dailyDigest: true } },
    )
    const wrapper = mountCard('apprentice')
    await settle()
    expect(wrapper.text()).toContain('Remind me before work is due')
    expect(wrapper.text()).not.toContain('daily digest')
    const input = switchInput(wrapper, 'dueReminders')
    expect((input.element as HTMLInputElement).checked).toBe(true)
    await input.setValue(false)
    await settle()
    const patch = calls.find((c) => c.method === 'PATCH')!
    expect(patch.url).toContain('/api/auth/me/mail-preferences')
    expect(patch.body).toEqual({ dueReminders: false })
    expect((switchInput(wrapper, 'dueReminders').element as HTMLInputElement).checked).toBe(false)
  })

  it('offers an instructor the daily digest, and puts the switch back with the reason when saving fails', async () => {
    stubFetch((call) =>
      call.method === 'PATCH'
        ? { status: 503, body: { error: { code: 'unavailable', message: 'The server is busy, try again' } } }
        : { body: { dueReminders: true, dailyDigest: true } },
    )
    const wrapper = mountCard('instructor')
    await settle()
    expect(wrapper.text()).toContain('Send me a daily digest')
    expect(wrapper.text()).not.toContain('Remind me')
    await switchInput(wrapper, 'dailyDigest').setValue(false)
    await settle()
    expect(wrapper.get('[role="alert"]').text()).toContain('The server is busy, try again')
    expect((switchInput(wrapper, 'dailyDigest').element as HTMLInputElement).checked).toBe(true)
  })
})
