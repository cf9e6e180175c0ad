// The session store: sign-in, resuming from the refresh cookie, sign-out.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { useSessionStore } from '@/stores/session'
import { request } from '@/api/client'
import { z } from 'zod'
import { sessionBody, stubFetch } from './helpers'

describe('the session store', () => {
  beforeEach(() => {
    setActivePinia(createPinia())
    localStorage.clear()
  })
  afterEach(() => vi.unstubAllGlobals())

  it('keeps the user and the access token after signing in', async () => {
    const calls = stubFetch(() => ({ body: sessionBody('instructor') }))
    const session = useSessionStore()
    const user = await session.signIn({ email: 'wren.maddox@bench.example', password: 'a long pass phrase' })
    expect(calls[0]).toMatchObject({ url: '/api/auth/sign-in', method: 'POST' })
    expect(user.role).toBe('instructor')
    expect(session.signedIn).toBe(true)
    expect(session.guardState()).toEqual({ signedIn: true, role: 'instructor' })
  })

  it('gives later requests the token it holds', async () => {
    stubFetch(() => ({ body: sessionBody('apprentice', 'abc123') }))
    const session = useSessionStore()
    await session.signIn({ email: 'wren.maddox@bench.example', password: 'a long pass phrase' })
    const calls = stubFetch(() => ({ body: { items: [] } }))
    await request('/assignments', z.object({ items: z.array(z.unknown()) }))
    expect(calls[0].headers.get('authorization')).toBe('Bearer abc123')
  })

  it('resumes a session from the refresh cookie once per page load', async () => {
    localStorage.setItem('slipway.hadSession', '1')
    const calls = stubFetch(() => ({ body: sessionBody('apprentice') }))
    const session = useSessionStore()
    await Promise.all([session.restore(), session.restore()])
    await session.restore()
    expect(calls.filter((c) => c.url === '/api/auth/refresh')).toHaveLength(1)
    expect(session.role).toBe('apprentice')
  })

  it('does not ask for a refresh in a browser that never signed in', async () => {
    const calls = stubFetch(() => ({ status: 401, body: {} }))
    const session = useSessionStore()
    await session.restore()
    expect(calls).toHaveLength(0)
    expect(session.signedIn).toBe(false)
  })

  it('treats a refused refresh as signed out, not as an error', async () => {
    localStorage.setItem('slipway.hadSession', '1')
    stubFetch(() => ({
      status: 401,
      body: { error: { code: 'refresh_token_invalid', message: 'No session' } },
    }))
    const session = useSessionStore()
    await expect(session.restore()).resolves.toBeUndefined()
    expect(session.signedIn).toBe(false)
    expect(session.restored).toBe(true)
  })

  it('forgets the session on sign-out even when the server cannot be reached', async () => {
    stubFetch(() => ({ body: sessionBody() }))
    const session = useSessionStore()
    await session.signIn({ email: 'wren.maddox@bench.example', password: 'a long pass phrase' })
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    )
    await expect(session.signOut()).rejects.toMatchObject({ code: 'network' })
    expect(session.signedIn).toBe(false)
    expect(localStorage.getItem('slipway.hadSession')).toBeNull()
  })

  it('notes when a session ended by itself, so sign-in can say so', async () => {
    stubFetch(() => ({ body: sessionBody() }))
    const session = useSessionStore()
    await session.signIn({ email: 'wren.maddox@bench.example', password: 'a long pass phrase' })
    stubFetch(() => ({
      status: 401,
      body: { error: { code: 'refresh_token_reused', message: 'Signed out' } },
    }))
    await expect(request('/assignments', z.unknown())).rejects.toMatchObject({ status: 401 })
    expect(session.signedIn).toBe(false)
    expect(session.endedUnexpectedly).toBe(true)
  })
})
