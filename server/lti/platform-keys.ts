// The platforms' published signing keys, fetched from each registration's key set URL and kept in memory.
// A launch signed with a key id the cached set lacks makes one fresh fetch (the platform may have rotated
// its keys); a key id still unknown after that is remembered for a while, so a stream of made-up key ids
// cannot turn Slipway into a client hammering the platform.
import { importJWK, type JWK } from 'jose'

export interface PlatformKeyCacheOptions {
  /** How long a fetched key set is trusted without asking again (default one hour). */
  maxAgeMs?: number
  /** At most one fetch per key set URL in this interval, however many unknown key ids arrive (default 1 s). */
  minRefetchIntervalMs?: number
  /** How long a key id that the fresh key set still lacked is answered from memory (default 60 s). */
  unknownKidMemoryMs?: number
  fetchTimeoutMs?: number
}

interface CachedSet {
  keys: JWK[]
  fetchedAt: number
}

export class PlatformKeyError extends Error {
  constructor(
    readonly reason: 'unknown_key' | 'key_set_unavailable',
    message: string,
  ) {
    super(message)
  }
}

export interface PlatformKeyCache {
  /** The verification key for this key id from the platform's key set, fetching it again when unknown. */
  key(jwksUrl: string, kid: string, alg: string): Promise<CryptoKey | Uint8Array>
  /** How many times a key set was fetched (for tests). */
  readonly fetches: number
}

export function createPlatformKeyCache(options: PlatformKeyCacheOptions = {}): PlatformKeyCache {
  const maxAgeMs = options.maxAgeMs ?? 3_600_000
  const minRefetchIntervalMs = options.minRefetchIntervalMs ?? 1000
  const unknownKidMemoryMs = options.unknownKidMemoryMs ?? 60_000
  const sets = new Map<string, CachedSet>()
  const inFlight = new Map<string, Promise<CachedSet>>()
  const unknown = new Map<string, number>() // `${url} ${kid}` → when found missing
  let fetches = 0

  async function fetchSet(url: string): Promise<CachedSet> {
    let pending = inFlight.get(url)
    if (pending) return pending
    pending = (async () => {
      fetches++
      let body: unknown
      try {
        const response = await fetch(url, {
          headers: { accept: 'application/json' },
          signal: AbortSignal.timeout(options.fetchTimeoutMs ?? 5000),
        })
        if (!response.ok) throw new Error(`status ${response.status}`)
        body = await response.json()
      } catch (error) {
        throw new PlatformKeyError(
          'key_set_unavailable',
          `The platform's key set could not be read (${(error as Error).message})`,
        )
      }
      const keys = (body as { keys?: unknown })?.keys
      if (!Array.isArray(keys)) {
        throw new PlatformKeyError('key_set_unavailable', "The platform's key set is not a JSON Web Key Set")
      }
      const set = { keys: keys as JWK[], fetchedAt: Date.now() }
      sets.set(url, set)
      return set
    })().finally(() => inFlight.delete(url))
    inFlight.set(url, pending)
    return pending
  }

  const find = (set: CachedSet | undefined, kid: string) => set?.keys.find((k) => k.kid === kid)

  return {
    async key(url, kid, alg) {
      let set = sets.get(url)
      if (!set || Date.now() - set.fetchedAt > maxAgeMs) set = await fetchSet(url)
      let jwk = find(set, kid)
      const memoryKey = `${url} ${kid}`
      if (!jwk) {
        const seenMissing = unknown.get(memoryKey)
        const recentlyMissing = seenMissing !== undefined && Date.now() - seenMissing < unknownKidMemoryMs
        const recentlyFetched = Date.now() - set.fetchedAt < minRefetchIntervalMs
        if (!recentlyMissing && !recentlyFetched) jwk = find(await fetchSet(url), kid)
        if (!jwk) {
          unknown.set(memoryKey, Date.now())
          throw new PlatformKeyError('unknown_key', `The platform's key set has no key with id ${kid}`)
        }
        unknown.delete(memoryKey)
      }
      if (jwk.kty !== 'RSA') throw new PlatformKeyError('unknown_key', 'The signing key is not an RSA key')
      return importJWK({ ...jwk, alg }, alg)
    },
    get fetches() {
      return fetches
    },
  }
}
