// Replay: an attempt recorded on the server plays back on the same panel; scrubbing to a time shows
// the speed recorded at that time, the timeline names events in plain words, objectives not met by the
// end say "missed", and the replay fits a tablet and a phone without sideways scrolling.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { replay, sampleTimeline } from '../../shared/model'
import { toSimulationSetup } from '../../shared/scenario/setup'
import { scenarioSchema } from '../../shared/scenario/schema'
import type { Page } from 'playwright-core'
import { TERMINAL_LABEL_SIZE } from '../../src/simulator/scene/layout'
import { screenshot } from './support'
import {
  APPRENTICE,
  apiToken,
  panelTestBed,
  raiseLowerCompleteLog,
  scenarioVersionId,
  signInPage,
} from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const scenario = scenarioSchema.parse(
  JSON.parse(readFileSync(resolve('scenarios/raise-lower-commissioning.json'), 'utf8')),
)

async function sidewaysScroll(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)
}

function parseTime(text: string): number {
  const m = /(\d+):(\d+)\.(\d)/.exec(text)
  if (!m) throw new Error(`no time in "${text}"`)
  return (Number(m[1]) * 60 + Number(m[2])) * 1000 + Number(m[3]) * 100
}

describe('replaying an attempt', () => {
  const bed = panelTestBed({ width: 1400, height: 1000 })
  let attemptId: string
  const events = raiseLowerCompleteLog()

  beforeAll(async () => {
    const { url } = bed.app
    const token = await apiToken(url)
    const res = await fetch(`${url}/api/attempts`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
      body: JSON.stringify({
        id: crypto.randomUUID(),
        scenarioId: await scenarioVersionId(url, token, 'raise-lower-commissioning'),
        status: 'submitted',
        events,
      }),
    })
    if (!res.ok) throw new Error(`submission failed: ${res.status} ${await res.text()}`)
    attemptId = ((await res.json()) as { id: string }).id
  })

  it('shows the speed recorded at the time scrubbed to', async () => {
    const { page } = bed.browser
    await signInPage(page, bed.app.url)
    await page.goto(`${bed.app.url}/replay/${attemptId}`)
    const panel = new PanelDriver(page, scenario.start.devices)
    await panel.ready()
    // It names the apprentice and the attempt.
    await expect(page.getByTestId('workspace-subtitle').textContent()).resolves.toMatch(
      new RegExp(`^${APPRENTICE.name}'s attempt, submitted .* · graded \\d+ / 100`),
    )
    await page.getByTestId('replay-slider').scrollIntoViewIfNeeded()
    await screenshot(page, 'panel-replay-01-start')

    // Scrub by clicking the timeline about half-way (while the reference was being raised).
    const slider = page.getByTestId('replay-slider').locator('.v-slider-track')
    const box = (await slider.boundingBox())!
    await page.mouse.click(box.x + box.width * 0.45, box.y + box.height / 2)
    await expect.poll(async () => page.getByTestId('replay-time').textContent()).not.toMatch(/^\s*00:00\.0/)
    const t = parseTime((await page.getByTestId('replay-time').textContent()) ?? '')

    const expected = Math.round(sampleTimeline(replay(toSimulationSetup(scenario), events), t).speedRpm)
    expect(expected).toBeGreaterThan(0)
    await panel.openSheet('Values')
    await expect.poll(async () => page.getByTestId('live-rpm').first().textContent()).toBe(`${expected} rpm`)
    await expect.poll(() => panel.summary()).toContain(`${expected} rpm`)
    await screenshot(page, 'panel-replay-02-scrubbed')

    // The Schematic tab draws the wires as they were at that moment, not at the end.
    const wiredThen = events.filter((e) => e.type === 'wire.added' && e.t <= t).length
    expect(wiredThen).toBeGreaterThan(0)
    await panel.openSheet('Schematic')
    const markers = () =>
      page
        .getByTestId('schematic-drawing')
        .locator('svg text')
        .evaluateAll((texts) => texts.map((x) => x.textContent ?? '').filter((x) => /^W\d+ /.test(x)))
    await expect.poll(markers, { timeout: 15_000 }).toHaveLength(wiredThen)
    await screenshot(page, 'panel-replay-02-schematic')

    // The timeline, in words.
    await panel.openSheet('Timeline')
    const timeline = page.getByTestId('replay-timeline')
    await expect(
      timeline.getByText('Wire W4 BU added from Infeed run / stop 14 to DI1').count(),
    ).resolves.toBe(1)
    await expect(timeline.getByText('Meter probes on L1 and L2').count()).resolves.toBe(1)
    expect(await timeline.textContent()).not.toMatch(/wire\.added|meter\.probes|runSwitch/)

    // Playing on from there at 16× reaches the end of the attempt: the motor stopped by ramp.
    await panel.openSheet('Values')
    await page.getByRole('button', { name: '16×' }).click()
    await page.getByTestId('replay-play').click()
    await expect
      .poll(async () => page.getByTestId('live-rpm').first().textContent(), { timeout: 30_000 })
      .toBe('0 rpm')
    await screenshot(page, 'panel-replay-03-played-to-end')
    await panel.openSheet('Task')
    await expect(
      page.locator('[data-testid="objectives"] li[data-met="true"]').count(),
    ).resolves.toBeGreaterThan(3)
    // At the end, nothing reads "not met yet": each objective is met or missed. The motor stops a moment
    // before the attempt's last event, so the replay may still be playing: wait for its end.
    await expect
      .poll(() => page.locator('[data-testid="objectives"] li[data-state="open"]').count(), {
        timeout: 15_000,
      })
      .toBe(0)
  }, 180_000)

  it('fits a laptop, a tablet and a phone: labels readable, no sideways scrolling', async () => {
    const { page } = bed.browser
    for (const [width, height] of [
      [1366, 768],
      [768, 1024],
      [390, 844],
    ] as const) {
      await page.setViewportSize({ width, height })
      await page.goto(`${bed.app.url}/replay/${attemptId}`)
      await new PanelDriver(page, scenario.start.devices).ready()
      await page.waitForTimeout(300)
      expect(await sidewaysScroll(page), `sideways scrolling at ${width} px`).toBeLessThanOrEqual(1)
      const canvas = page.getByTestId('panel-canvas')
      const box = (await canvas.boundingBox())!
      expect(box.x).toBeGreaterThanOrEqual(0)
      expect(box.x + box.width).toBeLessThanOrEqual(width)
      // The app's top bar never covers the panel.
      const bar = (await page.locator('header.v-app-bar').boundingBox())!
      expect(box.y).toBeGreaterThanOrEqual(bar.y + bar.height)
      if (width === 1366) {
        // Terminal labels at fit: at least 11 CSS px (WCAG has no minimum; our own readability floor).
        const scale = Number(await canvas.getAttribute('data-scale'))
        expect(scale * TERMINAL_LABEL_SIZE).toBeGreaterThanOrEqual(11)
      }
      await screenshot(page, `panel-replay-${width}x${height}`)
      await new PanelDriver(page, scenario.start.devices).openSheet('Schematic')
      await page.getByTestId('schematic-drawing').locator('svg').waitFor()
      expect(await sidewaysScroll(page), `sideways scrolling at ${width} px (schematic)`).toBeLessThanOrEqual(
        1,
      )
      await page.waitForTimeout(400) // the tab's slide
      await screenshot(page, `panel-replay-schematic-${width}x${height}`)
      // The whole window for the drawing, over the panel; Escape gives the sheet back.
      await page.getByTestId('schematic-large').click()
      await expect(page.getByRole('dialog', { name: /Control circuit as wired/ }).count()).resolves.toBe(1)
      await screenshot(page, `panel-replay-schematic-large-${width}x${height}`)
      await page.keyboard.press('Escape')
      await page.getByTestId('schematic-large').waitFor()
    }
    await page.setViewportSize({ width: 1400, height: 1000 })
  }, 120_000)
})
