// Calling a platform's LTI Advantage services: an access token from its token endpoint (OAuth 2.0 client
// credentials with a signed JWT assertion, RFC 7523 as the 1EdTech Security Framework §4.1 profiles it),
// kept until shortly before it expires, then the service request with that token.
import { z } from 'zod'
import type { AppContext } from '../context'
import type { LtiPlatformRow } from '../entities'
import { signWithToolKey } from './tool-keys'

/** A service call that failed; `retry` says whether trying again later may help. */
export class PlatformServiceError extends Error {
  constructor(
    message: string,
    readonly retry: boolean,
  ) {
    super(message)
  }
}

const tokenResponseSchema = z.looseObject({
  access_token: z.string().min(1),
  token_type: z.string().optional(),
  expires_in: z.coerce.number().positive().optional(),
  scope: z.string().optional(),
})

interface CachedToken {
  token: string
  expiresAtMs: number
}

export interface ServiceTokenCache {
  get(key: string): CachedToken | undefined
  set(key: string, token: CachedToken): void
  delete(key: string): void
}

export function createServiceTokenCache(): ServiceTokenCache {
  const tokens = new Map<string, CachedToken>()
  return {
    get: (key) => {
      const hit = tokens.get(key)
      // A minute's margin, so a token never runs out between being picked and being used.
      return hit && hit.expiresAtMs - 60_000 > Date.now() ? hit : undefined
    },
    set: (key, token) => void tokens.set(key, token),
    delete: (key) => void tokens.delete(key),
  }
}

const TIMEOUT_MS = 10_000

async function requestToken(
  ctx: Pick<AppContext, 'dataSource'>,
  platform: LtiPlatformRow,
  scopes: string[],
): Promise<CachedToken> {
  const assertion = await signWithToolKey(
    ctx.dataSource,
    { iss: platform.clientId, sub: platform.clientId, aud: platform.tokenEndpoint },
    300,
  )
  let response: Response
  try {
    response = await fetch(platform.tokenEndpoint, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'application/json' },
      body: new URLSearchParams({
        grant_type: 'client_credentials',
        client_assertion_type: 'urn:ietf:params:oauth:client-assertion-type:jwt-bearer',
        client_assertion: assertion,
        scope: scopes.join(' '),
      }),
      signal: AbortSignal.timeout(TIMEOUT_MS),
    })
  } catch {
    throw new PlatformServiceError('The platform could not be reached for an access token.', true)
  }
  if (!response.ok) {
    // 400/401: the platform refuses Slipway (wrong client id, key not registered, scope not granted).
    const retry = response.status >= 500 || response.status === 429
    throw new PlatformServiceError(
      retry
        ? `The platform's token service is unavailable (status ${response.status}).`
        : `The platform refused Slipway an access token (status ${response.status}): check the client id, the key set URL and the services granted to the tool.`,
      retry,
    )
  }
  const parsed = tokenResponseSchema.safeParse(await response.json().catch(() => undefined))
  if (!parsed.success) throw new PlatformServiceError('The platform sent an unreadable access token.', true)
  return {
    token: parsed.data.access_token,
    expiresAtMs: Date.now() + (parsed.data.expires_in ?? 3600) * 1000,
  }
}

/**
 * Calls a service URL with an access token for these scopes. A 401 drops the cached token and tries once
 * more with a fresh one (the platform may have revoked it early).
 */
export async function callPlatform(
  ctx: Pick<AppContext, 'dataSource'>,
  tokens: ServiceTokenCache,
  platform: LtiPlatformRow,
  scopes: string[],
  url: string,
  init: { method?: string; headers?: Record<string, string>; body?: string } = {},
): Promise<Response> {
  const key = `${platform.id} ${[...scopes].sort().join(' ')}`
  for (let attempt = 0; ; attempt++) {
    let cached = tokens.get(key)
    if (!cached) tokens.set(key, (cached = await requestToken(ctx, platform, scopes)))
    let response: Response
    try {
      response = await fetch(url, {
        method: init.method ?? 'GET',
        headers: { ...init.headers, authorization: `Bearer ${cached.token}` },
        body: init.body,
        signal: AbortSignal.timeout(TIMEOUT_MS),
      })
    } catch {
      throw new PlatformServiceError('The platform could not be reached.', true)
    }
    if (response.status === 401 && attempt === 0) {
      tokens.delete(key)
      continue
    }
    return response
  }
}

/** A service answer that is not a success, in plain words. */
export function serviceFailure(what: string, response: Response): PlatformServiceError {
  const retry = response.status >= 500 || response.status === 429 || response.status === 401
  return new PlatformServiceError(
    `The platform did not accept ${what} (status ${response.status}${retry ? '; Slipway will try again' : ''}).`,
    retry,
  )
}
