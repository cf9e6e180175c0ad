// The admin outbox as an admin meets it: where each message stands in words, the status filter, and sending a
// failed message again.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import type { OutboxMessage, OutboxPage } from '@shared/api'
import AdminOutboxView from '@/views/AdminOutboxView.vue'
import { stubFetch, testPlugins } from './helpers'

async function settle() {
  await flushPromises()
  await new Promise((r) => setTimeout(r, 0))
  await flushPromises()
}

const message = (over: Partial<OutboxMessage>): OutboxMessage => ({
  id: '0d3f7a52-1c2b-4e3f-9a57-1b2c3d4e5f60',
  from: 'Slipway <no-reply@slipway.test>',
  to: 'someone@bench.example',
  subject: 'You are invited',
  status: 'sent',
  attempts: 1,
  maxAttempts: 12,
  lastError: null,
  createdAt: '2026-11-30T09:00:00.000Z',
  nextAttemptAt: null,
  finishedAt: '2026-11-30T09:00:01.000Z',
  body: { text: 'Hello', html: '<p>Hello</p>' },
  ...over,
})

const failed = message({
  id: '1e4a8b63-2d3c-4f40-8b68-2c3d4e5f6071',
  to: 'unknown.user@bench.example',
  status: 'failed',
  attempts: 12,
  lastError: 'The mail relay refused the message for good',
})
const waiting = message({
  id: '2f5b9c74-3e4d-4051-9c79-3d4e5f607182',
  to: 'slow.relay@bench.example',
  status: 'queued',
  attempts: 3,
  lastError: 'The mail relay did not answer in time',
  nextAttemptAt: '2026-11-30T10:00:00.000Z',
  finishedAt: null,
})

function page(items: OutboxMessage[]): OutboxPage {
  return {
    items,
    total: items.length,
    page: 1,
    pageSize: 20,
    counts: { queued: 1, sending: 0, sent: 1, failed: 1 },
    local: true,
  }
}

describe('the mail outbox', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  async function mountOutbox() {
    const { router, pinia, vuetify } = testPlugins([{ path: '/admin/outbox', component: AdminOutboxView }])
    await router.push('/admin/outbox')
    const wrapper = mount(AdminOutboxView, {
      global: { plugins: [pinia, router, vuetify] },
      attachTo: document.body,
    })
    await settle()
    return wrapper
  }

  it('says where each message stands and why, with counts per status', async () => {
    stubFetch(() => ({ body: page([waiting, failed, message({})]) }))
    const wrapper = await mountOutbox()
    const text = wrapper.text()
    expect(text).toContain(
      'Attempt 3 of 12 did not go through. The mail relay did not answer in time. Next try',
    )
    expect(text).toContain('after 12 attempts. The mail relay refused the message for good.')
    expect(text).toContain('Not sent (1)')
    expect(text).not.toMatch(/\bfailed\b|\bqueued\b/) // the API's words stay in the API
  })

  it('asks for one status when its chip is chosen', async () => {
    const calls = stubFetch(() => ({ body: page([failed]) }))
    const wrapper = await mountOutbox()
    const chip = wrapper.findAll('.v-chip').find((c) => c.text().startsWith('Not sent'))!
    await chip.trigger('click')
    await settle()
    expect(calls.at(-1)!.url).toContain('status=failed')
  })

  it('sends a failed message again and reloads the list', async () => {
    const calls = stubFetch((call) =>
      call.method === 'POST'
        ? { body: { message: { ...failed, status: 'queued', attempts: 0, finishedAt: null } } }
        : { body: page(calls.some((c) => c.method === 'POST') ? [] : [failed]) },
    )
    const wrapper = await mountOutbox()
    await wrapper.get(`button[aria-label="Send “${failed.subject}” to ${failed.to} again"]`).trigger('click')
    await settle()
    const post = calls.find((c) => c.method === 'POST')!
    expect(post.url).toMatch(new RegExp(`/api/admin/outbox/${failed.id}/retry$`))
    expect(calls.filter((c) => c.method === 'GET').length).toBe(2)
  })
})
