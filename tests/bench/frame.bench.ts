// Panel frame cost in headless Chromium: the panel's own script time per frame (it records them when
// opened with ?perf) over 600 frames at fit zoom, with 20 wires on the panel and the motor running.
// Needs the production build (npm run build:client). Run alone:
//   npx tsx --tsconfig tsconfig.node.json tests/bench/frame.bench.ts
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pathToFileURL } from 'node:url'
import type { BrowserContext, Page } from 'playwright-core'
import { startSlipway } from '../support/server-process'
import { formatTable, type BenchRow } from './table'

const FRAMES = 600
const WIRES = 20

/** Extra wires in parallel with the commissioning log's seven (same nets), so the drive still runs. */
function withWires(events: { t: number; type: string }[], total: number) {
  const pairs = [
    ['drive.p24', 'runSwitch.a'],
    ['runSwitch.a', 'raiseButton.a'],
    ['raiseButton.a', 'lowerButton.a'],
    ['drive.p24', 'lowerButton.a'],
    ['drive.dcom', 'drive.0v'],
    ['runSwitch.b', 'drive.di1'],
    ['raiseButton.b', 'drive.di2'],
    ['lowerButton.b', 'drive.di3'],
  ]
  const have = events.filter((e) => e.type === 'wire.added').length
  const lastWire = events.findLastIndex((e) => e.type === 'wire.added')
  const extra = Array.from({ length: total - have }, (_, i) => ({
    t: events[lastWire]!.t + 100 * (i + 1),
    type: 'wire.added',
    id: `w${have + i + 1}`,
    from: pairs[i % pairs.length]![0],
    to: pairs[i % pairs.length]![1],
    colour: 'blue',
  }))
  return [...events.slice(0, lastWire + 1), ...extra, ...events.slice(lastWire + 1)]
}
const percentile = (sorted: number[], p: number) =>
  sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!

/**
 * The browser-test helpers belong to the e2e TypeScript project, which this (node) project may not
 * list, so they are loaded by a computed specifier and typed here by what this file uses.
 */
interface E2eHelpers {
  launchBrowser(options: { width: number; height: number }): Promise<{
    context: BrowserContext
    page: Page
    close(): Promise<void>
  }>
  signInPage(page: Page, url: string): Promise<void>
  apiToken(url: string): Promise<string>
  scenarioVersionId(url: string, token: string, key: string): Promise<string>
  dismissSafetyNotice(page: Page): Promise<void>
  skipTour(page: Page): Promise<void>
  raiseLowerRunningLog(): { t: number; type: string }[]
}

async function e2eHelpers(): Promise<E2eHelpers> {
  const from = (path: string) => import(new URL(path, import.meta.url).href)
  return { ...(await from('../e2e/support/browser.ts')), ...(await from('../e2e/panel-fixtures.ts')) }
}

/** What the page offers the callbacks below (typed here: this file compiles without the DOM library). */
interface PageGlobals {
  localStorage: { setItem(key: string, value: string): void }
  __slipwayFrameTimes?: number[]
}

export interface FrameFigures {
  frames: number
  median: number
  p95: number
}

export async function measureFrames(): Promise<FrameFigures> {
  const {
    launchBrowser,
    signInPage,
    apiToken,
    scenarioVersionId,
    dismissSafetyNotice,
    skipTour,
    raiseLowerRunningLog,
  } = await e2eHelpers()
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-bench-frame-'))
  const server = await startSlipway(dataDir)
  const browser = await launchBrowser({ width: 1280, height: 900 })
  try {
    const { page } = browser
    await signInPage(page, server.url)
    const versionId = await scenarioVersionId(
      server.url,
      await apiToken(server.url),
      'raise-lower-commissioning',
    )
    const events = withWires(raiseLowerRunningLog(), WIRES)
    // The attempt is restored from local storage, as after a reload, so the motor is already running.
    const saved = JSON.stringify({
      version: 1,
      attemptId: crypto.randomUUID(),
      events,
      savedAt: new Date().toISOString(),
    })
    await page.evaluate(
      ([key, value]) => (globalThis as unknown as PageGlobals).localStorage.setItem(key, value),
      [`slipway.attempt.practice.${versionId}`, saved] as const,
    )
    await page.goto(`${server.url}/simulator/raise-lower-commissioning?perf`)
    await dismissSafetyNotice(page)
    // Functions, not strings: the page's CSP (no 'unsafe-eval') refuses string evaluation, as it should.
    await page.waitForFunction(
      () => Array.isArray((globalThis as unknown as PageGlobals).__slipwayFrameTimes),
      null,
      {
        timeout: 30_000,
      },
    )
    const canvas = page.getByTestId('panel-canvas')
    await canvas.scrollIntoViewIfNeeded()
    const label = async () => (await canvas.getAttribute('aria-label')) ?? ''
    const deadline = Date.now() + 30_000
    while (!new RegExp(`running, 1\\d{3} rpm, ${WIRES} wires`).test(await label())) {
      if (Date.now() > deadline) throw new Error(`the motor is not running: ${await label()}`)
      await new Promise((r) => setTimeout(r, 250))
    }
    await skipTour(page)
    await page.evaluate(() => ((globalThis as unknown as PageGlobals).__slipwayFrameTimes = []))
    await page.waitForFunction(
      (frames) => ((globalThis as unknown as PageGlobals).__slipwayFrameTimes?.length ?? 0) >= frames,
      FRAMES,
      { timeout: 200_000, polling: 1000 },
    )
    const times = (
      await page.evaluate(
        (frames) => (globalThis as unknown as PageGlobals).__slipwayFrameTimes!.slice(0, frames),
        FRAMES,
      )
    ).sort((a, b) => a - b)
    return { frames: times.length, median: percentile(times, 50), p95: percentile(times, 95) }
  } finally {
    await browser.close()
    await server.stop()
    rmSync(dataDir, { recursive: true, force: true })
  }
}

export function frameRows(f: FrameFigures): BenchRow[] {
  const group = 'panel'
  return [
    {
      group,
      name: `script time per frame, median (${f.frames} frames, ${WIRES} wires, motor running, fit zoom)`,
      value: f.median,
      unit: 'ms',
    },
    {
      group,
      name: `script time per frame, p95 (${f.frames} frames, ${WIRES} wires, motor running, fit zoom)`,
      value: f.p95,
      unit: 'ms',
      target: '< 4 ms',
      met: f.frames === FRAMES && f.p95 < 4,
    },
  ]
}

/** The runner `npm run bench` calls. */
export async function runFrameBench(): Promise<BenchRow[]> {
  return frameRows(await measureFrames())
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  console.log(formatTable(frameRows(await measureFrames())))
}
