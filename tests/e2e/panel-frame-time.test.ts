// Frame cost while the motor runs, measured in Chromium over 600 frames: the panel's own script
// time per frame (model advance, view, scene update and Pixi's draw calls). The attempt is restored
// from the browser's local storage, which is also how a reload loses nothing.
import { describe, expect, it } from 'vitest'
import { screenshot } from './support'
import {
  apiToken,
  openSignedIn,
  panelTestBed,
  raiseLowerRunningLog,
  scenarioVersionId,
  signInPage,
} from './panel-fixtures'

/** What the panel exposes on the page when opened with ?perf. */
interface FramePage {
  __slipwayFrameTimes?: number[]
}

const percentile = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]

describe('the panel while the motor runs', () => {
  const bed = panelTestBed({ width: 1280, height: 900 })

  it('resumes a saved attempt after a reload and measures 600 frames of script time', async () => {
    const { page } = bed.browser
    const { url } = bed.app
    await signInPage(page, url)
    const versionId = await scenarioVersionId(url, await apiToken(url), 'raise-lower-commissioning')
    const events = raiseLowerRunningLog()
    await page.evaluate(
      ([key, log]) =>
        localStorage.setItem(
          key,
          JSON.stringify({
            version: 1,
            attemptId: crypto.randomUUID(),
            events: log,
            savedAt: new Date().toISOString(),
          }),
        ),
      [`slipway.attempt.practice.${versionId}`, events] as const,
    )
    const { panel } = await openSignedIn(page, url, 'raise-lower-commissioning', '?perf')
    await page.waitForFunction(
      () => Array.isArray((globalThis as unknown as FramePage).__slipwayFrameTimes),
      null,
      { timeout: 30_000 },
    )
    await page.getByTestId('panel-canvas').scrollIntoViewIfNeeded()
    // The saved attempt came back: its seven wires, and the motor running as it was.
    await expect.poll(() => panel.summary(), { timeout: 20_000 }).toMatch(/running, 1\d{3} rpm, 7 wires/)
    expect(await panel.state.savedEvents()).toHaveLength(events.length)

    await page.evaluate(() => ((globalThis as unknown as FramePage).__slipwayFrameTimes = []))
    await page.waitForFunction(
      () => ((globalThis as unknown as FramePage).__slipwayFrameTimes?.length ?? 0) >= 600,
      null,
      {
        timeout: 200_000,
        polling: 1000,
      },
    )
    const times = (
      await page.evaluate(() => (globalThis as unknown as FramePage).__slipwayFrameTimes!.slice(0, 600))
    ).sort((a: number, b: number) => a - b)
    await screenshot(page, 'panel-frame-time-running')
    const median = percentile(times, 50)
    const p95 = percentile(times, 95)
    console.log(
      `panel script time per frame over ${times.length} frames: median ${median.toFixed(2)} ms, p95 ${p95.toFixed(2)} ms`,
    )
    expect(times).toHaveLength(600)
    expect(median).toBeGreaterThan(0)
  }, 300_000)
})
