// Wiring while energised is allowed, but recorded and shown as a safety violation.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { dismissSafetyNotice, signInPage } from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const scenario = JSON.parse(readFileSync(resolve('scenarios/raise-lower-commissioning.json'), 'utf8'))

describe('wiring on a live panel', () => {
  let app: RunningApp
  let browser: BrowserSession

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser({ width: 1400, height: 1000 })
  })

  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('flags a wire added with the supply on and again while the DC bus is charged; a wire can be picked and deleted', async () => {
    const { page } = browser
    await signInPage(page, app.url)
    await page.goto(`${app.url}/simulator/raise-lower-commissioning`)
    await dismissSafetyNotice(page)
    await page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
    const panel = new PanelDriver(page, scenario.start.devices)
    await page.getByTestId('panel-canvas').scrollIntoViewIfNeeded()

    await panel.lock() // remove the lock
    await panel.disconnect() // supply on
    await panel.waitFor((s) => s.includes('disconnect on'))
    await panel.wire('drive.p24', 'runSwitch.a')
    const warning = page.getByTestId('safety-warning').first()
    await warning.waitFor({ timeout: 10_000 })
    await expect(warning.textContent()).resolves.toMatch(/supply disconnect is ON/)
    await screenshot(page, 'panel-energised-01-supply-on')

    await panel.disconnect() // supply off: the bus stays charged for a while
    await panel.waitFor((s) => s.includes('disconnect off'))
    await panel.wire('runSwitch.b', 'drive.di1')
    await expect
      .poll(async () => page.getByTestId('safety-warning').first().textContent(), { timeout: 10_000 })
      .toMatch(/DC bus is still at \d+ V/)
    await screenshot(page, 'panel-energised-02-bus-charged')

    // Select the first wire on the canvas and remove it with the Delete key.
    await panel.click(panel.wirePoint('drive.p24', 'runSwitch.a', 0))
    await expect.poll(async () => page.getByTestId('announcer').textContent()).toMatch(/Wire w1 selected/)
    await page.keyboard.press('Delete')
    await expect
      .poll(async () => page.getByRole('list', { name: 'Wires' }).getByRole('listitem').count())
      .toBe(1)
    await screenshot(page, 'panel-energised-03-wire-removed')
  }, 180_000)
})
