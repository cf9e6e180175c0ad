// Verified access tokens are remembered, so a client's every request does not recompute the HMAC — but a
// remembered token still expires on the second its `exp` names, and nothing about it is trusted for a
// different token string.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { createAccessTokens } from '../../server/infrastructure/security/tokens'
import { TEST_JWT_SECRET } from '../support/api-harness'

describe('access token verification cache', () => {
  afterEach(() => vi.useRealTimers())
  const claims = { sub: 'b6f3b3c4-3d6e-4d8a-9a44-1f0f3b8f5a11', role: 'instructor' as const, tv: 2 }

  it('refuses a token verified earlier once it has expired, with token_expired', () => {
    vi.useFakeTimers({ now: new Date('2026-12-01T10:00:00.000Z') })
    const tokens = createAccessTokens(TEST_JWT_SECRET, 60)
    const { token } = tokens.issue(claims)
    expect(tokens.verify(token)).toEqual(claims)
    vi.setSystemTime(new Date('2026-12-01T10:00:59.999Z'))
    expect(tokens.verify(token)).toEqual(claims) // from memory, still inside its minute
    vi.setSystemTime(new Date('2026-12-01T10:01:00.000Z'))
    expect(() => tokens.verify(token)).toThrow(
      expect.objectContaining({ status: 401, code: 'token_expired' }),
    )
  })

  it('refuses a tampered copy of a token it has already verified', () => {
    const tokens = createAccessTokens(TEST_JWT_SECRET)
    const { token } = tokens.issue(claims)
    tokens.verify(token)
    const [header, , signature] = token.split('.')
    const raised = Buffer.from(JSON.stringify({ ...claims, role: 'admin' })).toString('base64url')
    expect(() => tokens.verify(`${header}.${raised}.${signature}`)).toThrow(
      expect.objectContaining({ status: 401, code: 'token_invalid' }),
    )
  })

  it('does not share what one secret verified with an app signing with another', () => {
    const { token } = createAccessTokens(TEST_JWT_SECRET).issue(claims)
    const other = createAccessTokens('another-secret-'.padEnd(48, 'y'))
    expect(() => other.verify(token)).toThrow(expect.objectContaining({ code: 'token_invalid' }))
  })
})
