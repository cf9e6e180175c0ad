// Replay: an attempt recorded on the server plays back on the same panel; scrubbing to a time shows
// the speed recorded at that time, and the timeline marks the events.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { beforeAll, describe, expect, it } from 'vitest'
import { replay, sampleTimeline } from '../../shared/model'
import { toSimulationSetup } from '../../shared/scenario/setup'
import { scenarioSchema } from '../../shared/scenario/schema'
import { screenshot } from './support'
import {
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
    await expect.poll(() => panel.summary()).toContain(`${expected} rpm`)
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
