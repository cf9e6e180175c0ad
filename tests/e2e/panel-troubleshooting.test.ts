// A troubleshooting job on the panel: the speed creeps up because the RAISE button has the wrong
// contact block. Find it with the meter, isolate, wait for the DC bus, prove dead, fit the right
// block, then prove the pump holds its speed and submit.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { dismissSafetyNotice, signInPage } from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const scenario = JSON.parse(readFileSync(resolve('scenarios/creeping-speed-wrong-contact.json'), 'utf8'))

describe('finding and repairing a wrong contact block', () => {
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

  it('is found with the meter, repaired under lockout, proved and passed', async () => {
    const { page } = browser
    await signInPage(page, app.url)
    await page.goto(`${app.url}/simulator/creeping-speed-wrong-contact`)
    await dismissSafetyNotice(page)
    await page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
    const panel = new PanelDriver(page, scenario.start.devices)
    await panel.waitFor((s) => s.includes('drive ready'))

    // With nothing pressed the raise input should be off; the meter shows it is fed.
    await page.getByRole('tab', { name: 'Live values' }).click()
    await panel.probe('red', 'drive.di2', null)
    await panel.probe('black', 'drive.0v', null)
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/2\d\.\d+ V/)
    await screenshot(page, 'panel-troubleshoot-01-raise-fed-at-rest')

    // Isolate, lock, and let the DC bus discharge (time sped up).
    await panel.disconnect()
    await panel.lock()
    await page.getByRole('button', { name: 'Time runs 60 times faster' }).click()
    await expect
      .poll(
        async () => Number(/(\d+) V/.exec((await page.getByTestId('live-bus').textContent()) ?? '')?.[1]),
        {
          timeout: 60_000,
        },
      )
      .toBeLessThan(30)
    await page.getByRole('button', { name: 'Time runs 1 times faster' }).click()

    // Prove dead across the line pairs and the DC bus.
    await panel.probe('red', 'drive.l1', 'drive.di2')
    await panel.probe('black', 'drive.l2', 'drive.0v')
    await panel.probe('black', 'drive.l3', 'drive.l2')
    await panel.probe('red', 'drive.l2', 'drive.l1')
    await panel.probe('red', 'drive.l1', 'drive.l2')
    await panel.probe('red', 'drive.dcp', 'drive.l1')
    await panel.probe('black', 'drive.dcn', 'drive.l3')
    await screenshot(page, 'panel-troubleshoot-02-proved-dead')

    // Fit a normally open block on RAISE.
    await page.getByTestId('repair-device').click()
    await page.getByRole('option', { name: 'Raise' }).click()
    await page.getByRole('button', { name: 'NO block' }).click()
    await page.getByRole('button', { name: 'Fit new contact block' }).click()

    // Back in service: the raise input is now off at rest, and raise works and holds.
    await panel.probe('red', 'drive.di2', 'drive.dcp')
    await panel.probe('black', 'drive.0v', 'drive.dcn')
    await panel.lock()
    await panel.disconnect()
    await panel.waitFor((s) => s.includes('drive ready'))
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*-?\d\.\d+ V/)
    await panel.click(panel.device('runSwitch'))
    await panel.waitFor((s) => /drive (speeding up|running)/.test(s))
    await page.waitForTimeout(3000)
    await panel.pressDevice('raiseButton')
    await page.waitForTimeout(2500)
    await panel.release()
    await page.waitForTimeout(4000)
    await screenshot(page, 'panel-troubleshoot-03-holds-speed')
    await panel.click(panel.device('runSwitch'))

    await page.getByRole('tab', { name: 'Task' }).click()
    await page.getByTestId('submit-attempt').click()
    const grade = page.getByTestId('attempt-grade')
    await grade.waitFor({ timeout: 30_000 })
    await grade.scrollIntoViewIfNeeded()
    await screenshot(page, 'panel-troubleshoot-04-graded')
    await expect(grade.textContent()).resolves.toMatch(/— passed/)
  }, 300_000)
})
