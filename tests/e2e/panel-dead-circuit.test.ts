// A second troubleshooting job: the fan will not start. The control fuse is blown and the run wire
// is broken inside. Isolate, prove dead, replace the fuse and the wire, then run the fan at 40 Hz.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { dismissSafetyNotice, signInPage } from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const scenario = JSON.parse(readFileSync(resolve('scenarios/dead-control-circuit.json'), 'utf8'))

describe('a dead control circuit', () => {
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

  it('is repaired under lockout (fuse and broken wire) and the fan runs and passes', async () => {
    const { page } = browser
    await signInPage(page, app.url)
    await page.goto(`${app.url}/simulator/dead-control-circuit`)
    await dismissSafetyNotice(page)
    await page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
    const panel = new PanelDriver(page, scenario.start.devices)
    await page.getByRole('tab', { name: 'Live values' }).click()

    // The +24 V supply reads nothing against 0V: the fuse.
    await panel.probe('red', 'drive.p24', null)
    await panel.probe('black', 'drive.0v', null)
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*-?0\.\d+ V/)
    await screenshot(page, 'panel-dead-01-no-supply')

    await panel.isolateAndDischarge()
    await panel.proveDead({ red: 'drive.p24', black: 'drive.0v' })
    await page.getByRole('button', { name: 'Replace control fuse' }).click()
    // Replace the run wire: remove it from the list, draw a new one on the canvas.
    await page.getByRole('button', { name: /^Remove wire W\S* BU from Fan run \/ stop 14 to DI1/ }).click()
    await panel.wire('runSwitch.b', 'drive.di1')
    await expect(page.getByRole('list', { name: 'Wires' }).getByRole('listitem').count()).resolves.toBe(3)
    await screenshot(page, 'panel-dead-02-repaired')

    await panel.probe('red', null, 'drive.dcp')
    await panel.probe('black', null, 'drive.dcn')
    await panel.lock()
    await panel.disconnect()
    await panel.waitFor((s) => s.includes('drive ready'))
    await panel.click(panel.device('runSwitch'))
    await panel.waitFor((s) => s.includes('drive running'), 30_000)
    await page.getByRole('button', { name: 'Time runs 10 times faster' }).click()
    await page.waitForTimeout(1500)
    await page.getByRole('button', { name: 'Time runs 1 times faster' }).click()
    await screenshot(page, 'panel-dead-03-fan-running')
    await panel.click(panel.device('runSwitch'))

    await page.getByRole('tab', { name: 'Task' }).click()
    await page.getByTestId('submit-attempt').click()
    const grade = page.getByTestId('attempt-grade')
    await grade.waitFor({ timeout: 30_000 })
    await grade.scrollIntoViewIfNeeded()
    await screenshot(page, 'panel-dead-04-graded')
    await expect(grade.textContent()).resolves.toMatch(/— passed/)
  }, 300_000)
})
