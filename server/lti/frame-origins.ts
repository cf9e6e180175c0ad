// Which sites may show Slipway in a frame: the registered platforms' own origins (issuer, sign-in page and
// any the admin added). Read from the database at most every few seconds, so a registration made on another
// instance is honoured shortly after; a change made here takes effect at once.
import type { DataSource } from 'typeorm'
import { LtiPlatformEntity } from '../entities'

export interface FrameOriginCache {
  /** CSP frame-ancestors sources for the platforms' pages ([] when no platform is registered). */
  origins(): Promise<string[]>
  invalidate(): void
}

const originOf = (url: string): string | undefined => {
  try {
    const { protocol, origin } = new URL(url)
    return protocol === 'https:' || protocol === 'http:' ? origin : undefined
  } catch {
    return undefined
  }
}

export function createFrameOriginCache(ds: DataSource, maxAgeMs = 10_000): FrameOriginCache {
  let cached: { origins: string[]; at: number } | undefined
  let loading: Promise<string[]> | undefined
  async function load(): Promise<string[]> {
    const platforms = await ds.getRepository(LtiPlatformEntity).find({
      select: { issuer: true, authorizationEndpoint: true, extraFrameOrigins: true },
    })
    const origins = new Set<string>()
    for (const p of platforms) {
      for (const url of [
        p.issuer,
        p.authorizationEndpoint,
        ...(JSON.parse(p.extraFrameOrigins) as string[]),
      ]) {
        const origin = originOf(url)
        if (origin) origins.add(origin)
      }
    }
    return [...origins].sort()
  }
  return {
    async origins() {
      if (cached && Date.now() - cached.at < maxAgeMs) return cached.origins
      loading ??= load()
        .then((origins) => {
          cached = { origins, at: Date.now() }
          return origins
        })
        .finally(() => (loading = undefined))
      return loading
    },
    invalidate() {
      cached = undefined
    },
  }
}
