// Who teaches a cohort, as its own instructor and as a co-instructor meet it: the owner adds a colleague
// by e-mail (checked before sending) and removes one; a co-instructor sees no add form and may only leave.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import CohortInstructorsCard from '@/components/cohorts/CohortInstructorsCard.vue'
import { useSessionStore } from '@/stores/session'
import { ids, sessionBody, stubFetch, testPlugins } from './helpers'

const COLLEAGUE = '5c1d2e3f-4a5b-4c6d-8e7f-0a1b2c3d4e5f'
const owner = {
  userId: ids.user,
  name: 'Wren Maddox',
  email: 'wren.maddox@bench.example',
  owner: true,
  since: '2026-09-01T08:00:00.000Z',
}
const colleague = {
  userId: COLLEAGUE,
  name: 'Cato Colleague',
  email: 'cato@bench.example',
  owner: false,
  since: '2026-10-01T08:00:00.000Z',
}

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

async function mountCard(me: string, ownerId = ids.user) {
  const { pinia, router, vuetify } = testPlugins()
  const session = useSessionStore(pinia)
  session.user = { ...sessionBody('instructor').user, id: me }
  const wrapper = mount(CohortInstructorsCard, {
    props: { cohortId: ids.cohort, cohortName: 'Kestrel Vale evening class', ownerId, archived: false },
    global: { plugins: [pinia, router, vuetify] },
    attachTo: document.body,
  })
  await settle()
  return wrapper
}

describe('the instructors of a cohort', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('lets the cohort’s own instructor add a colleague, checking the address first', async () => {
    let list = [owner]
    const calls = stubFetch((call) => {
      if (call.method === 'POST') {
        list = [owner, colleague]
        return { status: 201, body: colleague }
      }
      return { body: { items: list } }
    })
    const wrapper = await mountCard(ids.user)
    expect(wrapper.text()).toContain('the cohort’s own instructor')
    await wrapper.find('input[type="email"]').setValue('not an address')
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.text()).toContain('Must be an e-mail address')
    expect(calls.filter((c) => c.method === 'POST')).toHaveLength(0)

    await wrapper.find('input[type="email"]').setValue('Cato@Bench.example')
    await wrapper.find('form').trigger('submit')
    await settle()
    const post = calls.find((c) => c.method === 'POST')!
    expect(post.url).toContain(`/cohorts/${ids.cohort}/instructors`)
    expect(post.body).toEqual({ email: 'cato@bench.example' })
    expect(wrapper.text()).toContain('Cato Colleague')
    expect(wrapper.get('[aria-label="Remove Cato Colleague"]').text()).toBe('Remove')
  })

  it('shows the server’s reason under the address', async () => {
    stubFetch((call) =>
      call.method === 'POST'
        ? {
            status: 400,
            body: {
              error: {
                code: 'validation_failed',
                message: 'No active instructor account has this address',
                details: { fields: { email: ['No active instructor account has this address'] } },
              },
            },
          }
        : { body: { items: [owner] } },
    )
    const wrapper = await mountCard(ids.user)
    await wrapper.find('input[type="email"]').setValue('nobody@bench.example')
    await wrapper.find('form').trigger('submit')
    await settle()
    expect(wrapper.text()).toContain('No active instructor account has this address')
    expect(wrapper.text()).not.toContain('validation_failed')
  })

  it('gives a co-instructor no add form, and a way to leave after a confirmation', async () => {
    const calls = stubFetch((call) =>
      call.method === 'DELETE' ? { status: 204 } : { body: { items: [owner, colleague] } },
    )
    const wrapper = await mountCard(COLLEAGUE)
    expect(wrapper.find('input[type="email"]').exists()).toBe(false)
    expect(wrapper.find('[aria-label="Remove Wren Maddox"]').exists()).toBe(false)
    await wrapper.get('[aria-label="Leave this cohort"]').trigger('click')
    await settle()
    expect(document.body.textContent).toContain('Leave Kestrel Vale evening class?')
    expect(calls.filter((c) => c.method === 'DELETE')).toHaveLength(0)
    const confirm = [...document.querySelectorAll('button')].find((b) =>
      b.textContent?.includes('Leave cohort'),
    )!
    confirm.click()
    await settle()
    const del = calls.find((c) => c.method === 'DELETE')!
    expect(del.url).toContain(`/cohorts/${ids.cohort}/instructors/${COLLEAGUE}`)
  })
})
