// A third troubleshooting job: no input ever turns ON. The inputs are set for source logic and the
// common is not wired. Set sink logic from the settings list, wire DIC to 0V under lockout, then
// run the feeder at 30 Hz with the raise button.
import { describe, expect, it } from 'vitest'
import { screenshot } from './support'
import { diagnose, openPanel, panelTestBed, submitForGrade } from './panel-fixtures'

// 30 Hz on the 6-pole 50 Hz, 970 rpm motor: n = 120·f/p · (1 − s) = 600 · 0.97 = 582 rpm
// (synchronous speed and slip formulas as quoted in REFERENCES.md).
const TARGET_RPM = 582

describe('inputs that never turn on', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('are fixed with the settings list and a common wire, and the feeder runs at 30 Hz', async () => {
    const { page, panel } = await openPanel(bed, 'inputs-never-on')
    await panel.waitFor((s) => s.includes('drive ready'))

    // The side panel writes the same events as the keypad.
    // Diagnosed before each change: the input logic set wrong, the input common not connected.
    await diagnose(page, 'Setting: Input logic', 'Set to the wrong value')
    await diagnose(page, 'Terminal DIC', 'Loose, or not connected at all')
    await panel.openSheet('Settings')
    await page.getByTestId('setting-inputs.logic').click()
    await page.getByRole('option', { name: /^Sink/ }).click()
    await page.getByTestId('settings-save').click()
    await expect.poll(async () => page.getByTestId('settings-save').isDisabled()).toBe(true)
    await screenshot(page, 'panel-logic-01-sink-saved')

    await panel.isolateAndDischarge()
    await panel.proveDead()
    await panel.wire('drive.dcom', 'drive.0v')
    await panel.probe('red', null)
    await panel.probe('black', null)
    await panel.removeLock()
    await panel.switchDisconnect('on')
    await panel.waitFor((s) => s.includes('drive ready'))

    await panel.setSelector('runSwitch', 1)
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
    await panel.setTimeSpeed(10)
    await page.waitForTimeout(1500)
    await panel.setTimeSpeed(1)
    await screenshot(page, 'panel-logic-02-feeder-at-30hz')
    await panel.setSelector('runSwitch', 0)

    expect(await submitForGrade(page, 'panel-logic-03-graded')).toMatch(/— passed/)
  }, 300_000)
})
