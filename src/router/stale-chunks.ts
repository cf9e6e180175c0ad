// After a deploy, an open tab may ask for a lazy chunk that no longer exists: reload once instead
// of leaving a blank screen. A timestamp in sessionStorage stops a reload loop.
const KEY = 'slipway.chunkReloadAt'

import { browserStorage } from '@/composables/browserStorage'
export function isChunkLoadError(error: unknown): boolean {
  const message = error instanceof Error ? error.message : String(error)
  return /Failed to fetch dynamically imported module|error loading dynamically imported module|Importing a module script failed|Unable to preload CSS/i.test(
    message,
  )
}

export function reloadForFreshChunks(targetPath: string, now = Date.now()): boolean {
  const last = Number(browserStorage('sessionStorage').getItem(KEY) ?? 0)
  if (now - last < 10_000) return false
  browserStorage('sessionStorage').setItem(KEY, String(now))
  window.location.assign(targetPath)
  return true
}
