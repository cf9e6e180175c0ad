// The class view as an instructor meets it: rows from the cohort's open panels, updated from the class
// stream as apprentices work, sortable, idle and disconnected in words; the empty and error states; a
// message with its confirmation. The apprentice's panel: the watching indicator and an instructor's message.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import type { LiveRow, LiveStatus } from '@shared/api/live'
import LiveClassView from '@/views/LiveClassView.vue'
import LiveWatchers from '@/simulator/components/LiveWatchers.vue'
import LiveInstructorMessages from '@/simulator/components/LiveInstructorMessages.vue'
import { testPlugins, testVuetify } from '../client/helpers'

const cohortId = '6d1e2f30-4a5b-4c6d-8e7f-8091a2b3c4d5'
const uuid = (n: number) => `00000000-0000-4000-8000-${String(n).padStart(12, '0')}`
const status = (over: Partial<LiveStatus> = {}): LiveStatus => ({
  powerOn: false,
  ownLock: true,
  supervisorLock: false,
  driveState: 'Dark',
  outputHz: 0,
  alarms: [],
  safetyViolations: 0,
  objectivesMet: 1,
  objectivesTotal: 5,
  ...over,
})
const now = Date.now()
function row(n: number, name: string, over: Partial<LiveRow> = {}): LiveRow {
  return {
    attemptId: uuid(n),
    apprentice: { id: uuid(100 + n), name },
    scenario: { key: 'raise-lower', title: 'Raise and lower commissioning', versionId: uuid(200) },
    assignmentTitle: null,
    assistance: 'standard',
    openedAt: new Date(now - n * 60_000).toISOString(),
    lastActionAt: new Date(now - 5_000).toISOString(),
    lastSeenAt: new Date(now - 2_000).toISOString(),
    connection: 'active',
    eventCount: 3,
    status: status(),
    watchers: [],
    ...over,
  }
}

/** A fetch answering the class snapshot, the stream (fed by `push`) and the message route. */
function serve(snapshot: { status?: number; body: unknown }) {
  let feed: ReadableStreamDefaultController<Uint8Array> | null = null
  const encoder = new TextEncoder()
  const sentMessages: unknown[] = []
  const fetchStub = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = String(input)
    if (url.endsWith('/stream'))
      return new Response(new ReadableStream({ start: (c) => void (feed = c) }), {
        headers: { 'content-type': 'text/event-stream' },
      })
    if (url.includes('/live/messages')) {
      sentMessages.push(JSON.parse(String(init?.body)))
      return Response.json({ sent: 1 })
    }
    return Response.json(snapshot.body, { status: snapshot.status ?? 200 })
  })
  vi.stubGlobal('fetch', fetchStub)
  let id = 0
  return {
    sentMessages,
    /** The connection drops (the server restarted, say). */
    drop() {
      feed?.close()
    },
    push(event: unknown) {
      id += 1
      feed?.enqueue(encoder.encode(`id: ${id}\nevent: x\ndata: ${JSON.stringify(event)}\n\n`))
    },
  }
}

async function settle() {
  for (let i = 0; i < 4; i++) {
    await flushPromises()
    await new Promise((r) => setTimeout(r, 0))
  }
}

async function mountView() {
  const { router, pinia, vuetify } = testPlugins([
    { path: '/teach/cohorts/:id/live', name: 'live-class', component: LiveClassView },
    { path: '/teach/cohorts/:id', name: 'cohort-detail', component: LiveClassView },
    { path: '/teach/live/attempts/:id', name: 'live-watch', component: LiveClassView },
  ])
  await router.push(`/teach/cohorts/${cohortId}/live`)
  const wrapper = mount(LiveClassView, {
    global: { plugins: [pinia, router, vuetify] },
    attachTo: document.body,
  })
  await settle()
  return wrapper
}

const names = (w: ReturnType<typeof mount>) => w.findAll('[data-testid="live-row-name"]').map((n) => n.text())

describe('the class view', () => {
  afterEach(() => {
    vi.unstubAllGlobals()
    document.body.innerHTML = ''
  })

  it('lists the open panels and updates a row as the class stream reports it', async () => {
    const server = serve({
      body: {
        cohort: { id: cohortId, name: 'Evening intake' },
        rows: [row(1, 'Wren Maddox'), row(2, 'Ash Tolley')],
      },
    })
    const wrapper = await mountView()
    expect(wrapper.text()).toContain('Evening intake: live class')
    expect(names(wrapper)).toEqual(['Ash Tolley', 'Wren Maddox'])
    expect(wrapper.get('[data-testid="live-stream"]').text()).toContain('Live: updates arrive')

    server.push({
      type: 'row',
      row: row(1, 'Wren Maddox', {
        status: status({
          powerOn: true,
          ownLock: false,
          driveState: 'Running',
          outputHz: 42.5,
          safetyViolations: 2,
        }),
      }),
    })
    server.push({ type: 'row', row: row(2, 'Ash Tolley', { connection: 'disconnected' }) })
    server.push({
      type: 'row',
      row: row(3, 'Cal Brennick', {
        connection: 'idle',
        lastActionAt: new Date(now - 180_000).toISOString(),
      }),
    })
    await settle()
    const wren = wrapper.findAll('[data-testid="live-row"]').find((r) => r.text().includes('Wren Maddox'))!
    expect(wren.get('[data-testid="live-row-drive"]').text()).toBe('Running, 42.5 Hz')
    expect(wren.get('[data-testid="live-row-safety"]').text()).toBe('2')
    expect(wren.text()).toContain('Power on')
    const text = wrapper.text()
    expect(text).toMatch(/Disconnected, last seen \d+ s ago/)
    expect(text).toContain('Idle for 3 min')

    server.push({ type: 'gone', attemptId: uuid(2) })
    await settle()
    expect(names(wrapper)).toEqual(['Cal Brennick', 'Wren Maddox'])
  })

  it('shows the stream lost in words, and reads the rows again when it is back', async () => {
    const snapshot = {
      body: {
        cohort: { id: cohortId, name: 'Evening intake' },
        rows: [row(1, 'Wren Maddox'), row(2, 'Ash Tolley')],
      },
    }
    const server = serve(snapshot)
    const wrapper = await mountView()
    expect(names(wrapper)).toEqual(['Ash Tolley', 'Wren Maddox'])
    // While the stream is away Ash closes the panel; the new connection cannot say so, the rows read again do.
    snapshot.body = { ...snapshot.body, rows: [row(1, 'Wren Maddox')] }
    server.drop()
    await settle()
    expect(wrapper.get('[data-testid="live-stream"]').text()).toContain('Live updates lost; trying again')
    await wrapper.get('[data-testid="live-reconnect"]').trigger('click')
    await settle()
    expect(wrapper.get('[data-testid="live-stream"]').text()).toContain('Live: updates arrive')
    expect(names(wrapper)).toEqual(['Wren Maddox'])
  })

  it('sorts by the column chosen, and reverses on a second click', async () => {
    serve({
      body: {
        cohort: { id: cohortId, name: 'Evening intake' },
        rows: [
          row(1, 'Wren Maddox', { status: status({ safetyViolations: 1 }) }),
          row(2, 'Ash Tolley', { status: status({ safetyViolations: 4 }) }),
          row(3, 'Cal Brennick', { status: status({ safetyViolations: 0 }) }),
        ],
      },
    })
    const wrapper = await mountView()
    await wrapper.get('[data-testid="live-sort-safety"]').trigger('click')
    expect(names(wrapper)).toEqual(['Ash Tolley', 'Wren Maddox', 'Cal Brennick'])
    await wrapper.get('[data-testid="live-sort-safety"]').trigger('click')
    expect(names(wrapper)).toEqual(['Cal Brennick', 'Wren Maddox', 'Ash Tolley'])
    await wrapper.get('[data-testid="live-sort-elapsed"]').trigger('click')
    // Open longest first.
    expect(names(wrapper)).toEqual(['Cal Brennick', 'Ash Tolley', 'Wren Maddox'])
  })

  it('says so when no panel is open, and shows a refusal in words with a retry', async () => {
    serve({ body: { cohort: { id: cohortId, name: 'Evening intake' }, rows: [] } })
    const empty = await mountView()
    expect(empty.text()).toContain('No apprentice has a panel open in this cohort')
    empty.unmount()
    document.body.innerHTML = ''

    serve({ status: 403, body: { error: { code: 'forbidden', message: 'You do not teach this cohort.' } } })
    const refused = await mountView()
    expect(refused.get('[role="alert"]').text()).toContain('You do not teach this cohort.')
    expect(refused.find('[data-testid="live-row"]').exists()).toBe(false)
  })

  it('sends a hint to one apprentice and confirms what was sent', async () => {
    const server = serve({
      body: { cohort: { id: cohortId, name: 'Evening intake' }, rows: [row(1, 'Wren Maddox')] },
    })
    const wrapper = await mountView()
    await wrapper.get('[data-testid="live-row-message"]').trigger('click')
    await settle()
    const text = document.querySelector<HTMLTextAreaElement>('[data-testid="live-message-text"] textarea')!
    text.value = 'Check the fuse holder with the meter.'
    text.dispatchEvent(new Event('input'))
    document.querySelector<HTMLButtonElement>('[data-testid="live-message-send"]')!.click()
    await settle()
    expect(server.sentMessages).toEqual([
      { cohortId, attemptIds: [uuid(1)], kind: 'hint', text: 'Check the fuse holder with the meter.' },
    ])
    expect(wrapper.get('[data-testid="live-last-sent"]').text()).toBe(
      'Hint sent to Wren Maddox: “Check the fuse holder with the meter.”',
    )
  })
})

describe('the apprentice’s panel', () => {
  it('shows in words whoever is watching, and nothing when nobody is', async () => {
    const wrapper = mount(LiveWatchers, {
      props: { watchers: [{ id: uuid(1), name: 'Idris Penhallow' }] },
      global: { plugins: [testVuetify()] },
    })
    expect(wrapper.get('[data-testid="live-watching"]').text()).toBe('Idris Penhallow is watching')
    await wrapper.setProps({
      watchers: [
        { id: uuid(1), name: 'Idris Penhallow' },
        { id: uuid(2), name: 'Morwenna Hale' },
      ],
    })
    expect(wrapper.get('[data-testid="live-watching"]').text()).toBe(
      'Idris Penhallow and Morwenna Hale are watching',
    )
    await wrapper.setProps({ watchers: [] })
    expect(wrapper.find('[data-testid="live-watching"]').exists()).toBe(false)
    expect(wrapper.get('[data-testid="live-watchers"]').attributes('aria-live')).toBe('polite')
  })

  it('shows an instructor’s hint without taking the focus, until it is closed', async () => {
    const button = document.createElement('button')
    document.body.appendChild(button)
    button.focus()
    const wrapper = mount(LiveInstructorMessages, {
      props: { messages: [] },
      global: { plugins: [testVuetify()] },
      attachTo: document.body,
    })
    await wrapper.setProps({
      messages: [{ id: uuid(9), kind: 'hint', text: 'Prove the meter first.', from: 'Idris Penhallow' }],
    })
    expect(wrapper.get('[data-testid="instructor-message"]').text()).toContain(
      'Hint from Idris Penhallow: Prove the meter first.',
    )
    expect(wrapper.get('[data-testid="instructor-message-announcer"]').attributes('aria-live')).toBe('polite')
    expect(document.activeElement).toBe(button)
    await wrapper.get('[data-testid="instructor-message"] button').trigger('click')
    expect(wrapper.find('[data-testid="instructor-message"]').exists()).toBe(false)
    wrapper.unmount()
    document.body.innerHTML = ''
  })
})
