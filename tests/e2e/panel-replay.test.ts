// Replay: an attempt recorded on the server plays back on the same panel; scrubbing to a time shows
// the speed recorded at that time, and the timeline marks the events.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { replay, sampleTimeline } from '../../shared/model'
import { toSimulationSetup } from '../../shared/scenario/setup'
import { scenarioSchema } from '../../shared/scenario/schema'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { apiToken, raiseLowerCompleteLog, scenarioVersionId, signInPage } from './panel-fixtures'

const scenario = scenarioSchema.parse(
  JSON.parse(readFileSync(resolve('scenarios/raise-lower-commissioning.json'), 'utf8')),
)

function parseTime(text: string): number {
  const m = /(\d+):(\d+)\.(\d)/.exec(text)
  if (!m) throw new Error(`no time in "${text}"`)
  return (Number(m[1]) * 60 + Number(m[2])) * 1000 + Number(m[3]) * 100
}

describe('replaying an attempt', () => {
  let app: RunningApp
  let browser: BrowserSession
  let attemptId: string
  const events = raiseLowerCompleteLog()

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser({ width: 1400, height: 1000 })
    const token = await apiToken(app.url)
    const res = await fetch(`${app.url}/api/attempts`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
      body: JSON.stringify({
        id: crypto.randomUUID(),
        scenarioId: await scenarioVersionId(app.url, token, 'raise-lower-commissioning'),
        status: 'submitted',
        events,
      }),
    })
    if (!res.ok) throw new Error(`submission failed: ${res.status} ${await res.text()}`)
    attemptId = ((await res.json()) as { id: string }).id
  })

  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('shows the speed recorded at the time scrubbed to', async () => {
    const { page } = browser
    await signInPage(page, app.url)
    await page.goto(`${app.url}/replay/${attemptId}`)
    await page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
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
    await expect.poll(async () => page.getByTestId('live-rpm').first().textContent()).toBe(`${expected} rpm`)
    await expect
      .poll(async () => page.getByTestId('panel-canvas').getAttribute('aria-label'))
      .toContain(`${expected} rpm`)
    await screenshot(page, 'panel-replay-02-scrubbed')

    // Playing on from there at 16× reaches the end of the attempt: the motor stopped by ramp.
    await page.getByRole('button', { name: '16×' }).click()
    await page.getByTestId('replay-play').click()
    await expect
      .poll(async () => page.getByTestId('live-rpm').first().textContent(), { timeout: 30_000 })
      .toBe('0 rpm')
    await screenshot(page, 'panel-replay-03-played-to-end')
    await expect(
      page.locator('[data-testid="objectives"] li[data-met="true"]').count(),
    ).resolves.toBeGreaterThan(3)
  }, 180_000)
})
