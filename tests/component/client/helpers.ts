// Test helpers for the client: a Vuetify instance, a JSON fetch stub, and a mounted-view wrapper.
import { createVuetify } from 'vuetify'
import { vi } from 'vitest'

export function testVuetify() {
  // Components are imported by vite-plugin-vuetify in each SFC, so the bare instance is enough.
  return createVuetify()
}

export interface StubCall {
  url: string
  method: string
  headers: Headers
  body: unknown
}

type Responder = (
  call: StubCall,
) => { status?: number; body?: unknown } | Promise<{ status?: number; body?: unknown }>

/** Replaces global fetch with a function answering from `respond`; returns the recorded calls. */
export function stubFetch(respond: Responder) {
  const calls: StubCall[] = []
  const fetchStub = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url
    const headers = new Headers(init?.headers)
    let body: unknown = init?.body
    if (typeof body === 'string') {
      try {
        body = JSON.parse(body)
      } catch {
        // not JSON
      }
    }
    const call = { url, method: (init?.method ?? 'GET').toUpperCase(), headers, body }
    calls.push(call)
    const { status = 200, body: reply } = await respond(call)
    return new Response(reply === undefined ? null : JSON.stringify(reply), {
      status,
      headers: { 'content-type': 'application/json' },
    })
  })
  vi.stubGlobal('fetch', fetchStub)
  return calls
}

export const ids = {
  user: '4b0c4f52-0d1c-4f3e-9a57-1b2c3d4e5f60',
  cohort: '6d1e2f30-4a5b-4c6d-8e7f-8091a2b3c4d5',
  assignment: '7e2f3a41-5b6c-4d7e-9f80-91a2b3c4d5e6',
  scenario: '8f3a4b52-6c7d-4e8f-a091-a2b3c4d5e6f7',
}

export function sessionBody(role: 'apprentice' | 'instructor' | 'admin' = 'apprentice', token = 'token-1') {
  return {
    accessToken: token,
    expiresAt: '2030-01-01T00:00:00.000Z',
    user: {
      id: ids.user,
      email: 'wren.maddox@bench.example',
      name: 'Wren Maddox',
      role,
      active: true,
      createdAt: '2026-09-01T08:00:00.000Z',
      lastSignInAt: null,
    },
  }
}

import { createPinia, setActivePinia } from 'pinia'
import { createMemoryHistory, createRouter, type RouteRecordRaw } from 'vue-router'
import { defineComponent, h } from 'vue'

const Blank = defineComponent({ render: () => h('div', 'page') })

/** Pinia, Vuetify and a memory router holding `routes` plus a catch-all, for mounting a view. */
export function testPlugins(routes: RouteRecordRaw[] = []) {
  const pinia = createPinia()
  setActivePinia(pinia)
  const router = createRouter({
    history: createMemoryHistory(),
    routes: [...routes, { path: '/:rest(.*)*', component: Blank }],
  })
  return { pinia, router, vuetify: testVuetify(), plugins: [pinia, router, testVuetify()] as const }
}
