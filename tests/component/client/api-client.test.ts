// The API client: access token header, one refresh on 401, typed errors, replies checked by the shared schemas.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { z } from 'zod'
import { connectAuth, request } from '@/api/client'
import { ApiError } from '@/api/errors'
import { stubFetch } from './helpers'

const okSchema = z.object({ ok: z.literal(true) })

describe('the API client', () => {
  let token: string | null
  const refresh = vi.fn<() => Promise<boolean>>()
  const signedOut = vi.fn()

  beforeEach(() => {
    token = 'old-token'
    refresh.mockReset()
    signedOut.mockReset()
    connectAuth({ accessToken: () => token, refresh, signedOut })
  })
  afterEach(() => vi.unstubAllGlobals())

  it('sends the access token and the credentials for the refresh cookie', async () => {
    const calls = stubFetch(() => ({ body: { ok: true } }))
    await request('/cohorts', okSchema)
    expect(calls[0].url).toBe('/api/cohorts')
    expect(calls[0].headers.get('authorization')).toBe('Bearer old-token')
  })

  it('refreshes once on a 401 and repeats the request with the new token', async () => {
    refresh.mockImplementation(async () => {
      token = 'new-token'
      return true
    })
    const calls = stubFetch((call) =>
      call.headers.get('authorization') === 'Bearer new-token'
        ? { body: { ok: true } }
        : { status: 401, body: { error: { code: 'token_expired', message: 'Expired' } } },
    )
    await expect(request('/cohorts', okSchema)).resolves.toEqual({ ok: true })
    expect(refresh).toHaveBeenCalledTimes(1)
    expect(calls).toHaveLength(2)
    expect(signedOut).not.toHaveBeenCalled()
  })

  it('signs out when the refresh is refused', async () => {
    refresh.mockResolvedValue(false)
    stubFetch(() => ({ status: 401, body: { error: { code: 'token_expired', message: 'Expired' } } }))
    await expect(request('/cohorts', okSchema)).rejects.toMatchObject({ status: 401, code: 'token_expired' })
    expect(signedOut).toHaveBeenCalledTimes(1)
  })

  it('signs out when the repeated request is still refused, without a second refresh', async () => {
    refresh.mockResolvedValue(true)
    const calls = stubFetch(() => ({
      status: 401,
      body: { error: { code: 'token_invalid', message: 'Bad token' } },
    }))
    await expect(request('/cohorts', okSchema)).rejects.toBeInstanceOf(ApiError)
    expect(refresh).toHaveBeenCalledTimes(1)
    expect(calls).toHaveLength(2)
    expect(signedOut).toHaveBeenCalledTimes(1)
  })

  it('shares one refresh between requests refused at the same time', async () => {
    let release!: () => void
    refresh.mockImplementation(
      () =>
        new Promise<boolean>((resolve) => {
          release = () => {
            token = 'new-token'
            resolve(true)
          }
        }),
    )
    stubFetch((call) =>
      call.headers.get('authorization') === 'Bearer new-token'
        ? { body: { ok: true } }
        : { status: 401, body: {} },
    )
    const both = Promise.all([request('/a', okSchema), request('/b', okSchema)])
    await vi.waitFor(() => expect(refresh).toHaveBeenCalled())
    release()
    await expect(both).resolves.toEqual([{ ok: true }, { ok: true }])
    expect(refresh).toHaveBeenCalledTimes(1)
  })

  it('does not try to refresh for calls that ask not to (sign-in itself)', async () => {
    stubFetch(() => ({
      status: 401,
      body: { error: { code: 'invalid_credentials', message: 'Wrong e-mail or password' } },
    }))
    await expect(
      request('/auth/sign-in', okSchema, { method: 'POST', refreshOn401: false }),
    ).rejects.toMatchObject({
      code: 'invalid_credentials',
      message: 'Wrong e-mail or password',
    })
    expect(refresh).not.toHaveBeenCalled()
  })

  it("turns the server's error body into an ApiError with field messages", async () => {
    stubFetch(() => ({
      status: 400,
      body: {
        error: {
          code: 'validation_failed',
          message: 'Check the highlighted fields',
          details: { fields: { email: ['Must be an e-mail address'], name: ['Enter a name'] } },
        },
      },
    }))
    const error = await request('/cohorts/x/invitations', okSchema, { method: 'POST', body: {} }).catch(
      (e) => e,
    )
    expect(error).toBeInstanceOf(ApiError)
    expect(error).toMatchObject({
      status: 400,
      code: 'validation_failed',
      message: 'Check the highlighted fields',
    })
    expect(error.fieldErrors()).toEqual({ email: 'Must be an e-mail address', name: 'Enter a name' })
  })

  it('gives a plain message for a server failure without an error body', async () => {
    stubFetch(() => ({ status: 503, body: undefined }))
    await expect(request('/cohorts', okSchema)).rejects.toMatchObject({ status: 503, code: 'server_error' })
  })

  it('reports a network failure as its own error code', async () => {
    vi.stubGlobal(
      'fetch',
      vi.fn(async () => Promise.reject(new TypeError('Failed to fetch'))),
    )
    await expect(request('/cohorts', okSchema)).rejects.toMatchObject({ status: 0, code: 'network' })
  })

  it('refuses a reply that does not match the shared schema', async () => {
    stubFetch(() => ({ body: { ok: 'yes' } }))
    await expect(request('/cohorts', okSchema)).rejects.toMatchObject({ code: 'bad_response' })
  })

  it('leaves out empty query parameters', async () => {
    const calls = stubFetch(() => ({ body: { ok: true } }))
    await request('/attempts', okSchema, { query: { page: 2, assignmentId: undefined, q: '' } })
    expect(calls[0].url).toBe('/api/attempts?page=2')
  })
})
