// The one API client: ofetch with the access token, one refresh on 401, typed errors, zod-parsed replies.
import { ofetch, FetchError } from 'ofetch'
import type { z } from 'zod'
import { ApiError, toApiError } from './errors'

export { ApiError } from './errors'

/** How the client reaches the session without importing the store (which imports the client). */
export interface AuthBridge {
  accessToken(): string | null
  /** Gets a new access token with the refresh cookie; resolves false when that is not possible. */
  refresh(): Promise<boolean>
  /** Called once a refreshed request is still refused: the session is over. */
  signedOut(): void
}

let bridge: AuthBridge = { accessToken: () => null, refresh: async () => false, signedOut: () => {} }

export function connectAuth(next: AuthBridge) {
  bridge = next
}

/** For readers that fetch on their own (event streams): the header every route needs, and one refresh. */
export function authorizationHeader(): Record<string, string> {
  const token = bridge.accessToken()
  return token ? { Authorization: `Bearer ${token}` } : {}
}
export const refreshAccess = () => refreshOnce()

const base = ofetch.create({
  baseURL: '/api',
  credentials: 'include',
  retry: 0,
  onRequest({ options }) {
    const token = bridge.accessToken()
    if (token && !options.headers.has('Authorization'))
      options.headers.set('Authorization', `Bearer ${token}`)
  },
})

type Query = Record<string, string | number | boolean | undefined | null>

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
  body?: unknown
  query?: Query
  signal?: AbortSignal
  /** false for the sign-in and refresh calls themselves: no refresh loop. */
  refreshOn401?: boolean
}

// Concurrent 401s share one refresh.
let refreshing: Promise<boolean> | null = null
function refreshOnce(): Promise<boolean> {
  refreshing ??= bridge.refresh().finally(() => (refreshing = null))
  return refreshing
}

function cleanQuery(query?: Query) {
  if (!query) return undefined
  return Object.fromEntries(
    Object.entries(query).filter(([, v]) => v !== undefined && v !== null && v !== ''),
  )
}

async function send<T>(
  path: string,
  opts: RequestOptions,
  responseType?: 'blob',
  onHeaders?: (headers: Headers) => void,
): Promise<T> {
  // ofetch types responseType per call; one loosely typed call site keeps the wrapper simple.
  const fetchAny = base as unknown as (p: string, o: Record<string, unknown>) => Promise<T>
  const call = () =>
    fetchAny(path, {
      method: opts.method ?? 'GET',
      body: opts.body,
      query: cleanQuery(opts.query),
      signal: opts.signal,
      ...(responseType ? { responseType } : {}),
      ...(onHeaders
        ? { onResponse: ({ response }: { response: Response }) => onHeaders(response.headers) }
        : {}),
    })
  try {
    return await call()
  } catch (e) {
    const err = asApiError(e)
    if (err.status !== 401 || opts.refreshOn401 === false) throw err
    if (!(await refreshOnce())) {
      bridge.signedOut()
      throw err
    }
    try {
      return await call()
    } catch (e2) {
      const again = asApiError(e2)
      if (again.status === 401) bridge.signedOut()
      throw again
    }
  }
}

function asApiError(e: unknown): ApiError {
  if (e instanceof ApiError) return e
  if (e instanceof FetchError) return toApiError(e.response?.status, e.data, e)
  if (e instanceof DOMException && e.name === 'AbortError') return new ApiError(0, 'aborted', 'Cancelled.')
  return toApiError(undefined, undefined, e)
}

/** Sends a request and parses the reply with the shared schema; a reply that does not match is an error. */
export async function request<S extends z.ZodType>(path: string, schema: S, opts: RequestOptions = {}) {
  const data = await send<unknown>(path, opts)
  const parsed = schema.safeParse(data)
  if (!parsed.success) {
    throw new ApiError(
      0,
      'bad_response',
      'The server sent a reply Slipway did not understand.',
      parsed.error.issues,
    )
  }
  return parsed.data as z.output<S>
}

/** For replies with no body worth reading (204, or an acknowledgement). */
export async function requestVoid(path: string, opts: RequestOptions = {}) {
  await send<unknown>(path, opts)
}

export async function requestBlob(path: string, opts: RequestOptions = {}) {
  return send<Blob>(path, opts, 'blob')
}

/** The file name a Content-Disposition header gives (`attachment; filename="…"`), if any. */
export function fileNameOf(disposition: string | null): string | null {
  return disposition?.match(/filename="([^"]+)"/)?.[1] ?? null
}

/**
 * Downloads a file the server produces (CSV export, backup) through the authenticated client, under the
 * name the server gives it, else `fallbackName`.
 */
export async function downloadFile(path: string, fallbackName: string | null, opts: RequestOptions = {}) {
  let served: string | null = null
  const blob = await send<Blob>(
    path,
    opts,
    'blob',
    (h) => (served = fileNameOf(h.get('content-disposition'))),
  )
  const url = URL.createObjectURL(blob)
  const a = document.createElement('a')
  a.href = url
  a.download = served ?? fallbackName ?? 'download'
  document.body.appendChild(a)
  a.click()
  a.remove()
  setTimeout(() => URL.revokeObjectURL(url), 1000)
  return blob
}
