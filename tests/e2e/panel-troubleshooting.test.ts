// A troubleshooting job on the panel: the speed creeps up because the RAISE button has the wrong
// contact block. Find it with the meter, isolate, wait for the DC bus, prove dead, fit the right
// block, then prove the pump holds its speed and submit.
import { describe, expect, it } from 'vitest'
import { screenshot } from './support'
import { diagnose, openPanel, panelTestBed, submitForGrade } from './panel-fixtures'

describe('finding and repairing a wrong contact block', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('is found with the meter, repaired under lockout, proved and passed', async () => {
    const { page, panel } = await openPanel(bed, 'creeping-speed-wrong-contact')
    await panel.waitFor((s) => s.includes('drive ready'))

    // With nothing pressed the raise input should be off; the meter shows it is fed.
    await panel.openSheet('Values')
    await panel.meterMode('dcVolts')
    await panel.probe('red', 'drive.di2')
    await panel.probe('black', 'drive.0v')
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/2\d\.\d+ V/)
    await screenshot(page, 'panel-troubleshoot-01-raise-fed-at-rest')
    await diagnose(page, 'Raise', 'Wrong contact type fitted')

    // Isolate, lock, let the DC bus discharge (time sped up), and prove dead across the line pairs
    // and the DC bus.
    await panel.isolateAndDischarge()
    await panel.proveDead()
    await screenshot(page, 'panel-troubleshoot-02-proved-dead')

    // Fit a normally open block on RAISE.
    await page.getByTestId('repair-device').click()
    await page.getByRole('option', { name: 'Raise' }).click()
    await page.getByRole('button', { name: 'NO block' }).click()
    await page.getByRole('button', { name: 'Fit new contact block' }).click()

    // Back in service: the raise input is now off at rest, and raise works and holds.
    await panel.probe('red', 'drive.di2')
    await panel.probe('black', 'drive.0v')
    await panel.removeLock()
    await panel.switchDisconnect('on')
    await panel.waitFor((s) => s.includes('drive ready'))
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*-?\d\.\d+ V/)
    await panel.setSelector('runSwitch', 1)
    await panel.waitFor((s) => /drive (speeding up|running)/.test(s))
    await page.waitForTimeout(3000)
    await panel.pressDevice('raiseButton')
    await page.waitForTimeout(2500)
    await panel.release()
    // With the right block the reference stays where raise left it (the fault made it creep up).
    const reference = () => page.getByTestId('live-reference').textContent()
    await page.waitForTimeout(500)
    const held = await reference()
    await page.waitForTimeout(4000)
    await expect(reference()).resolves.toBe(held)
    await screenshot(page, 'panel-troubleshoot-03-holds-speed')
    await panel.setSelector('runSwitch', 0)

    expect(await submitForGrade(page, 'panel-troubleshoot-04-graded')).toMatch(/— passed/)
  }, 300_000)
})
