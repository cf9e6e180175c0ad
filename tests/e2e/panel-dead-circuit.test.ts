// A second troubleshooting job: the fan will not start. The control fuse is blown and the run wire
// is broken inside. Isolate, prove dead, replace the fuse and the wire, then run the fan at 40 Hz.
import { describe, expect, it } from 'vitest'
import { screenshot } from './support'
import { openPanel, panelTestBed, submitForGrade } from './panel-fixtures'

describe('a dead control circuit', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('is repaired under lockout (fuse and broken wire) and the fan runs and passes', async () => {
    const { page, panel } = await openPanel(bed, 'dead-control-circuit')
    await panel.openSheet('Values')

    // The +24 V supply reads nothing against 0V: the fuse.
    await panel.meterMode('dcVolts')
    await panel.probe('red', 'drive.p24')
    await panel.probe('black', 'drive.0v')
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*-?0\.\d+ V/)
    await screenshot(page, 'panel-dead-01-no-supply')

    await panel.isolateAndDischarge()
    await panel.proveDead()
    await page.getByRole('button', { name: 'Replace control fuse' }).click()
    // Replace the run wire: remove it from the list, draw a new one on the canvas.
    await panel.openSheet('Wiring')
    await page.getByRole('button', { name: /^Remove wire W\S* BU from Fan run \/ stop 14 to DI1/ }).click()
    await panel.openSheet('Values')
    await panel.wire('runSwitch.b', 'drive.di1')
    expect(await panel.state.wires()).toHaveLength(3)
    await screenshot(page, 'panel-dead-02-repaired')

    await panel.probe('red', null)
    await panel.probe('black', null)
    await panel.removeLock()
    await panel.switchDisconnect('on')
    await panel.waitFor((s) => s.includes('drive ready'))
    await panel.setSelector('runSwitch', 1)
    await panel.waitFor((s) => s.includes('drive running'), 30_000)
    await panel.setTimeSpeed(10)
    await page.waitForTimeout(1500)
    await panel.setTimeSpeed(1)
    await screenshot(page, 'panel-dead-03-fan-running')
    await panel.setSelector('runSwitch', 0)

    expect(await submitForGrade(page, 'panel-dead-04-graded')).toMatch(/— passed/)
  }, 300_000)
})
