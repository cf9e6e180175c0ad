// A third troubleshooting job: no input ever turns ON. The inputs are set for source logic and the
// common is not wired. Set sink logic from the settings list, wire DCM to 0V under lockout, then
// run the feeder at 30 Hz with the raise button.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { dismissSafetyNotice, signInPage } from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const scenario = JSON.parse(readFileSync(resolve('scenarios/inputs-never-on.json'), 'utf8'))
// 30 Hz on the 6-pole 50 Hz, 970 rpm motor: n = 120·f/p · (1 − s) = 600 · 0.97 = 582 rpm
// (synchronous speed and slip formulas as quoted in REFERENCES.md).
const TARGET_RPM = 582

describe('inputs that never turn on', () => {
  let app: RunningApp
  let browser: BrowserSession

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser({ width: 1600, height: 1000 })
  })

  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('are fixed with the settings list and a common wire, and the feeder runs at 30 Hz', async () => {
    const { page } = browser
    await signInPage(page, app.url)
    await page.goto(`${app.url}/simulator/inputs-never-on`)
    await dismissSafetyNotice(page)
    await page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
    const panel = new PanelDriver(page, scenario.start.devices)
    await panel.waitFor((s) => s.includes('drive ready'))

    // The side panel writes the same events as the keypad.
    await page.getByRole('tab', { name: 'Settings' }).click()
    await page.getByTestId('setting-inputs.logic').click()
    await page.getByRole('option', { name: /^Sink/ }).click()
    await page.getByTestId('settings-save').click()
    await expect.poll(async () => page.getByTestId('settings-save').isDisabled()).toBe(true)
    await screenshot(page, 'panel-logic-01-sink-saved')

    await panel.isolateAndDischarge()
    await panel.proveDead({ red: null, black: null })
    await panel.wire('drive.dcom', 'drive.0v')
    await panel.probe('red', null, 'drive.dcp')
    await panel.probe('black', null, 'drive.dcn')
    await panel.lock()
    await panel.disconnect()
    await panel.waitFor((s) => s.includes('drive ready'))

    await panel.click(panel.device('runSwitch'))
    await panel.waitFor((s) => /drive (speeding up|running)/.test(s))
    await expect.poll(async () => page.getByTestId('live-di1').textContent()).toMatch(/DI1 ON/)
    await panel.pressDevice('raiseButton')
    await panel.waitFor((s) => Number(/(\d+) rpm/.exec(s)?.[1]) >= TARGET_RPM - 25, 40_000)
    await panel.release()
    for (let i = 0; i < 20; i++) {
      await page.waitForTimeout(600)
      const rpm = await panel.rpm()
      if (Math.abs(rpm - TARGET_RPM) <= 6) break
      await panel.pressDevice(rpm > TARGET_RPM ? 'lowerButton' : 'raiseButton')
      await page.waitForTimeout(Math.min(300, Math.abs(rpm - TARGET_RPM) * 10))
      await panel.release()
    }
    expect(Math.abs((await panel.rpm()) - TARGET_RPM)).toBeLessThanOrEqual(12)
    await page.getByRole('button', { name: 'Time runs 10 times faster' }).click()
    await page.waitForTimeout(1500)
    await page.getByRole('button', { name: 'Time runs 1 times faster' }).click()
    await screenshot(page, 'panel-logic-02-feeder-at-30hz')
    await panel.click(panel.device('runSwitch'))

    await page.getByRole('tab', { name: 'Task' }).click()
    await page.getByTestId('submit-attempt').click()
    const grade = page.getByTestId('attempt-grade')
    await grade.waitFor({ timeout: 30_000 })
    await grade.scrollIntoViewIfNeeded()
    await screenshot(page, 'panel-logic-03-graded')
    await expect(grade.textContent()).resolves.toMatch(/— passed/)
  }, 300_000)
})
