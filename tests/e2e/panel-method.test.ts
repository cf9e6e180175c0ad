// Troubleshooting graded on method (shared/scenario/README.md): the dead control circuit done as a
// fault-finder does it — measure, record a diagnosis, isolate, prove dead, repair, re-energise, prove it
// runs — passes; the same repairs made by swapping parts without measuring or diagnosing do not.
import type { Page } from 'playwright-core'
import { describe, expect, it } from 'vitest'
import type { PanelDriver } from './panel-driver'
import { diagnose, openPanel, openSignedIn, panelTestBed, submitForGrade } from './panel-fixtures'
import { backOn, lockedAndProvedDead } from './panel-isolation'

async function backOnAndRunning(page: Page, panel: PanelDriver) {
  await backOn(panel)
  await panel.setSelector('runSwitch', 1)
  await panel.waitFor((s) => s.includes('drive running'), 30_000)
  await panel.setTimeSpeed(10)
  await page.waitForTimeout(1500)
  await panel.setTimeSpeed(1)
  await panel.setSelector('runSwitch', 0)
}

/** Takes a wire off from the Wiring list and draws it again between the same terminals. */
async function remakeWire(page: Page, panel: PanelDriver, name: RegExp, from: string, to: string) {
  await panel.openSheet('Wiring')
  await page.getByRole('button', { name }).click()
  await panel.openSheet('Values')
  await panel.wire(from, to)
}

describe('troubleshooting graded on method', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('passes when each fault is measured and diagnosed before its repair', async () => {
    const { page, panel } = await openPanel(bed, 'dead-control-circuit')
    await panel.openSheet('Values')

    // +24 to 0V reads nothing with the display lit: the control supply is gone.
    await panel.meterMode('dcVolts')
    await panel.probe('red', 'drive.p24')
    await panel.probe('black', 'drive.0v')
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*-?0\.\d+ V/)
    await diagnose(page, 'Control fuse', 'Blown')
    await expect
      .poll(async () => page.getByTestId('diagnosis-last').textContent())
      .toMatch(/Last diagnosis: control fuse: blown/)

    await lockedAndProvedDead(page, panel)
    await page.getByRole('button', { name: 'Replace control fuse' }).click()
    await backOn(panel)
    await panel.setSelector('runSwitch', 1) // still nothing: the fan does not start

    // Across the run wire with RUN made: the supply, where a sound conductor reads about 0 V.
    await panel.probe('red', 'runSwitch.b')
    await panel.probe('black', 'drive.di1')
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/2\d\.\d+ V/)
    await diagnose(page, 'Wire W3', 'Open circuit')
    await panel.setSelector('runSwitch', 0)

    await lockedAndProvedDead(page, panel)
    await panel.openSheet('Wiring')
    await page.getByRole('button', { name: /^Remove wire W\S* BU from Fan run \/ stop 14 to DI1/ }).click()
    await panel.openSheet('Values')
    await panel.wire('runSwitch.b', 'drive.di1')
    // The diagnosis still names the wire by the marker it had, now that it has gone.
    await expect
      .poll(async () => page.getByTestId('diagnosis-last').textContent())
      .toMatch(/Last diagnosis: wire W3 BU: open circuit/)
    await backOnAndRunning(page, panel)

    expect(await submitForGrade(page, 'panel-method-01-graded-by-method')).toMatch(/— passed/)
  }, 400_000)

  it('fails when parts are swapped on a guess, even under lockout', async () => {
    // Signed in by the test before (tests in a file share the browser).
    const { page, panel } = await openSignedIn(bed.browser.page, bed.app.url, 'dead-control-circuit')
    await lockedAndProvedDead(page, panel)
    await page.getByRole('button', { name: 'Replace control fuse' }).click()
    await page.getByTestId('repair-device').click()
    await page.getByRole('option', { name: 'Fan run / stop' }).click()
    await page.getByRole('button', { name: 'Fit new contact block' }).click()
    await remakeWire(
      page,
      panel,
      /^Remove wire W\S* BU from Fan run \/ stop 14 to DI1/,
      'runSwitch.b',
      'drive.di1',
    )
    await remakeWire(page, panel, /^Remove wire W\S* BU from DIC to 0V/, 'drive.dcom', 'drive.0v')
    await backOnAndRunning(page, panel)

    expect(await submitForGrade(page, 'panel-method-02-graded-swapped')).toMatch(/— not passed/)
  }, 400_000)
})
