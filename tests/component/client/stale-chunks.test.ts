// After a deploy, a missing lazy chunk reloads the page once instead of leaving a blank screen.
import { afterEach, describe, expect, it, vi } from 'vitest'
import { isChunkLoadError, reloadForFreshChunks } from '@/router/stale-chunks'

describe('stale chunk recovery', () => {
  afterEach(() => {
    sessionStorage.clear()
    vi.restoreAllMocks()
  })

  it('recognises the browsers’ messages for a chunk that failed to load', () => {
    expect(
      isChunkLoadError(
        new TypeError('Failed to fetch dynamically imported module: /assets/GradebookView-1.js'),
      ),
    ).toBe(true)
    expect(isChunkLoadError(new TypeError('error loading dynamically imported module'))).toBe(true)
    expect(isChunkLoadError(new Error('Cannot read properties of undefined'))).toBe(false)
  })

  it('reloads once, and not again within a few seconds (no reload loop)', () => {
    const assign = vi.fn()
    vi.spyOn(window, 'location', 'get').mockReturnValue({ ...window.location, assign } as Location)
    expect(reloadForFreshChunks('/teach/gradebook', 1_000_000)).toBe(true)
    expect(reloadForFreshChunks('/teach/gradebook', 1_003_000)).toBe(false)
    expect(assign).toHaveBeenCalledTimes(1)
    expect(assign).toHaveBeenCalledWith('/teach/gradebook')
  })
})
