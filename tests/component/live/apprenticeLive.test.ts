// The apprentice's panel in the live classroom, mounted whole (Pixi mocked, the live routes faked): it opens
// the session and posts its actions in order, reads the inbox once the session is open, puts an instructor's
// fault into its own log (once, however often delivered), shows a hint and who is watching; for anyone but an
// apprentice it stays out of the live classroom.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { flushPromises, mount } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import { createVuetify } from 'vuetify'
import { fromCallback, fromPromise } from 'xstate'
import scenarioFile from '../../../scenarios/raise-lower-commissioning.json'
import type { LiveInboxEvent, PostLiveEventsRequest } from '@shared/api/live'
import { scenarioSchema } from '@shared/scenario/schema'
import { attemptStorageKey, createAttemptStore } from '@/simulator/storage/attemptStore'
import { useSessionStore } from '@/stores/session'
import { resetPixiState } from '../simulator/pixiMock'

vi.mock('pixi.js', () => import('../simulator/pixiMock'))
vi.mock('pixi.js/unsafe-eval', () => ({}))

const scenario = scenarioSchema.parse(scenarioFile)
const key = attemptStorageKey('version-1')

vi.mock('@/simulator/services', () => ({
  liveAttemptActors: () => ({
    loadStart: fromPromise(async () => ({
      scenario,
      scenarioTitle: scenario.title,
      scenarioVersionId: 'version-1',
      assignment: null,
      assistance: 'standard',
      store: createAttemptStore(key),
      browser: null,
      server: null,
      problem: null,
    })),
    loadServerCopy: fromPromise(async () => Promise.reject(new Error('offline'))),
    saveProgress: fromPromise(async () => Promise.reject(new Error('offline'))),
    submitAttempt: fromPromise(async ({ input }: { input: { id: string; events: { type: string }[] } }) =>
      live.submit(input),
    ),
    liveGrading: fromCallback(() => () => {}),
  }),
  replayActors: () => ({}),
}))

// The live routes: what the panel sent, and a hand on its inbox.
const live = vi.hoisted(() => ({
  opened: [] as string[],
  posts: [] as PostLiveEventsRequest[],
  inboxOpenedAfterSession: null as boolean | null,
  deliver: null as ((event: LiveInboxEvent) => void) | null,
  inboxOpens: 0,
  submitted: [] as string[][],
  submit: async (input: { id: string; events: { type: string }[] }): Promise<unknown> => {
    throw Object.assign(new Error(`offline ${input.id}`), { status: 0 })
  },
}))
vi.mock('@/live/liveApi', () => ({
  liveApi: {
    openSession: async (attemptId: string) => {
      live.opened.push(attemptId)
      return { attemptId, eventCount: 0 }
    },
    postEvents: async (_id: string, body: PostLiveEventsRequest) => {
      live.posts.push(structuredClone(body))
      return {}
    },
    close: async () => ({}),
  },
  liveStreams: {
    inbox: (_id: string, handlers: { onEvent: (e: LiveInboxEvent) => void }) => {
      live.inboxOpenedAfterSession = live.opened.length > 0
      live.inboxOpens += 1
      live.deliver = handlers.onEvent
      return { close: () => {}, reconnect: () => {}, lastEventId: () => null }
    },
  },
}))

const { default: SimulatorPanel } = await import('@/simulator/components/SimulatorPanel.vue')

const instructor = { id: '5c2d3e4f-5a6b-4c7d-8e9f-0a1b2c3d4e5f', name: 'Idris Penhallow' }
const injection: LiveInboxEvent = {
  type: 'injection',
  injectionId: '1a2b3c4d-5e6f-4a7b-8c9d-0e1f2a3b4c5d',
  fault: { kind: 'blownFuse' },
  by: instructor,
  at: '2026-12-03T06:00:00.000Z',
}

function mountPanel(role: 'apprentice' | 'instructor') {
  const pinia = createPinia()
  setActivePinia(pinia)
  useSessionStore().user = {
    id: '4b0c4f52-0d1c-4f3e-9a57-1b2c3d4e5f60',
    email: 'ravi@bench.example',
    name: 'Ravi Lindqvist',
    role,
    active: true,
    createdAt: '2026-09-01T08:00:00.000Z',
    lastSignInAt: null,
  } as never
  return mount(SimulatorPanel, {
    props: {
      request: { kind: 'live', target: { mode: 'practice', scenarioKey: scenario.id } },
      tourReady: false,
    },
    global: { plugins: [createVuetify(), pinia] },
    attachTo: document.body,
  })
}

async function settle(ms = 30) {
  await new Promise((r) => setTimeout(r, ms))
  await flushPromises()
  await new Promise((r) => setTimeout(r, ms))
  await flushPromises()
}

const saved = () => createAttemptStore(key).load().copy

describe('the apprentice’s panel, live', () => {
  beforeEach(() => {
    resetPixiState()
    localStorage.clear()
    Object.assign(live, {
      opened: [],
      posts: [],
      inboxOpenedAfterSession: null,
      deliver: null,
      inboxOpens: 0,
      submitted: [],
    })
  })
  afterEach(() => {
    localStorage.clear()
    document.body.innerHTML = ''
  })

  it('posts its actions in order, and takes an instructor’s fault, hint and watch from the inbox', async () => {
    const wrapper = mountPanel('apprentice')
    await settle()
    expect(live.opened).toHaveLength(1)
    expect(live.inboxOpenedAfterSession).toBe(true)
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    await settle(400)
    const sent = live.posts.flatMap((p) => p.events.map((e) => e.type))
    expect(sent).toEqual(['lock.applied'])
    expect(live.posts.at(-1)!.status).toMatchObject({ ownLock: true, supervisorLock: true, powerOn: false })

    live.deliver!(injection)
    live.deliver!(injection)
    live.deliver!({
      type: 'message',
      messageId: '2b3c4d5e-6f7a-4b8c-9d0e-1f2a3b4c5d6e',
      kind: 'hint',
      text: 'Measure before you replace anything.',
      from: instructor,
      at: '2026-12-03T06:00:01.000Z',
    })
    live.deliver!({ type: 'watchers', watchers: [instructor] })
    await settle(400)
    expect(saved()?.events.map((e) => e.type)).toEqual(['lock.applied', 'fault.injected', 'message.received'])
    // The same path as an action: posted on to the live copy too, in order.
    expect(live.posts.flatMap((p) => p.events.map((e) => e.type))).toEqual([
      'lock.applied',
      'fault.injected',
      'message.received',
    ])
    expect(wrapper.get('[data-testid="instructor-message"]').text()).toContain(
      'Hint from Idris Penhallow: Measure before you replace anything.',
    )
    expect(wrapper.get('[data-testid="live-watching"]').text()).toBe('Idris Penhallow is watching')
    // Never told what the fault is (the panel's own "Replace control fuse" repair is always there).
    expect(document.body.textContent).not.toMatch(/blown|blow the|fault was put|fuse has/i)
    expect(document.body.textContent).toContain('Idris Penhallow changed something on the bench')
    wrapper.unmount()
  })

  it('reads the inbox again and submits again when the server holds a fault the log lacks', async () => {
    live.submit = async (input) => {
      const types = input.events.map((e) => e.type)
      live.submitted.push(types)
      if (!types.includes('fault.injected'))
        throw Object.assign(new Error('An instructor changed the bench'), {
          status: 409,
          code: 'injection_pending',
        })
      return { id: input.id, status: 'submitted', eventCount: types.length, grade: null }
    }
    const wrapper = mountPanel('apprentice')
    await settle()
    expect(live.inboxOpens).toBe(1)
    await wrapper.get('[data-testid="submit-from-bar"]').trigger('click')
    await settle()
    document.querySelector<HTMLElement>('[data-testid="confirm-submit-button"]')!.click()
    await settle()
    // Refused: the inbox is opened again from its start, and its backlog goes into the log.
    expect(live.inboxOpens).toBe(2)
    live.deliver!(injection)
    await settle(700)
    expect(live.submitted).toEqual([['attempt.ended'], ['fault.injected', 'attempt.ended']])
    expect(saved()).toBeNull()
    wrapper.unmount()
  })

  it('stays out of the live classroom for an instructor trying a scenario', async () => {
    const wrapper = mountPanel('instructor')
    await settle()
    await wrapper.get('[data-testid="control-lock"]').trigger('click')
    await settle(400)
    expect(live.opened).toEqual([])
    expect(live.posts).toEqual([])
    wrapper.unmount()
  })
})
