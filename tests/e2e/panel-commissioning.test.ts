// The raise/lower commissioning scenario done by mouse on the canvas: add my lock beside the supervisor's,
// prove dead, wire from scratch by
// tap-tap (click a terminal, then the other), program with the keypad, start, raise to 1200 rpm, hold,
// lower, stop, submit (confirming), see the server's grade and follow its link to the result page.
import { describe, expect, it } from 'vitest'
import { screenshot } from './support'
import { openPanel, panelTestBed, submitForGrade } from './panel-fixtures'

const started = Date.now()
async function step(page: Parameters<typeof screenshot>[0], name: string) {
  console.log(`${((Date.now() - started) / 1000).toFixed(1)} s: ${name}`)
  await screenshot(page, name)
}

describe('commissioning raise/lower on the panel by mouse', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('wires, programs, commissions and submits, and the server grades it a pass', async () => {
    const { page, panel, pageErrors } = await openPanel(bed, 'raise-lower-commissioning')
    await step(page, 'panel-commission-01-start')

    // The supervisor's lock is on: add my own beside it, then prove absence of voltage under it.
    await panel.applyLock()
    await panel.proveDead()
    await step(page, 'panel-commission-02-proved-dead')
    await panel.probe('red', null)
    await panel.probe('black', null)

    // Sink logic from the drive's own supply: +24 feeds the contacts, DIC to 0V. Wired tap by tap.
    await panel.wire('drive.p24', 'runSwitch.a', 'taps')
    await panel.wire('runSwitch.a', 'raiseButton.a', 'taps')
    await panel.wire('raiseButton.a', 'lowerButton.a', 'taps')
    await panel.wire('runSwitch.b', 'drive.di1', 'taps')
    await panel.wire('raiseButton.b', 'drive.di2', 'taps')
    await panel.wire('lowerButton.b', 'drive.di3', 'taps')
    await panel.wire('drive.dcom', 'drive.0v', 'taps')
    expect(await panel.state.wires()).toHaveLength(7)
    await panel.openSheet('Wiring')
    await expect(page.getByRole('list', { name: 'Wires' }).getByRole('listitem').count()).resolves.toBe(7)
    await step(page, 'panel-commission-03-wired')

    // The Schematic tab draws the seven wires, each marker once, readable on a laptop, tablet and phone.
    await panel.openSheet('Schematic')
    const drawing = page.getByTestId('schematic-drawing').locator('svg')
    const markers = () =>
      drawing
        .locator('text')
        .evaluateAll((texts) => texts.map((t) => t.textContent ?? '').filter((text) => /^W\d+ /.test(text)))
    await expect.poll(markers, { timeout: 15_000 }).toHaveLength(7)
    expect(new Set((await markers()).map((m) => m.split(' ')[0])).size).toBe(7)
    for (const [width, height] of [
      [1366, 768],
      [768, 1024],
      [390, 844],
    ] as const) {
      await page.setViewportSize({ width, height })
      await panel.openSheet('Schematic')
      await page.getByTestId('schematic').scrollIntoViewIfNeeded()
      // The drawing scrolls inside its own frame; the frame and the page stay within the window.
      const box = (await page.locator('.schematic__scroll').boundingBox())!
      expect(box.x + box.width, `drawing's frame inside the page at ${width} px`).toBeLessThanOrEqual(width)
      const sideways = await page.evaluate(
        () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
      )
      expect(sideways, `sideways scrolling at ${width} px`).toBeLessThanOrEqual(1)
      await page.waitForTimeout(400) // the tab's slide
      await step(page, `panel-commission-03-schematic-${width}x${height}`)
    }
    await page.setViewportSize({ width: 1600, height: 1000 })
    await page.evaluate(() => window.scrollTo(0, 0))

    await panel.removeLock()
    await panel.askSupervisorToUnlock()
    await panel.switchDisconnect('on')
    await panel.waitFor((s) => s.includes('drive ready'))

    // Keypad: control from terminals, DI1 run, DI2 raise, DI3 lower, reference from raise/lower.
    await panel.key('enter') // settings groups
    await panel.key('down') // command source
    await panel.key('enter') // "Run commands from"
    await panel.key('enter')
    await panel.key('down') // terminals
    await panel.key('enter') // save
    await panel.key('back')
    await panel.key('down') // digital inputs
    await panel.key('enter')
    await panel.key('down') // DI1 function
    await panel.key('enter')
    await panel.key('down') // run
    await panel.key('enter')
    await panel.key('down') // DI2 function
    await panel.key('enter')
    await panel.key('down', 4) // raise
    await panel.key('enter')
    await panel.key('down') // DI3 function
    await panel.key('enter')
    await panel.key('down', 5) // lower
    await panel.key('enter')
    await step(page, 'panel-commission-04-programmed-inputs')
    await panel.key('back')
    await panel.key('down') // speed reference
    await panel.key('enter')
    await panel.key('enter') // remote reference: analog → raise/lower
    await panel.key('down')
    await panel.key('enter')
    await panel.key('back', 2)

    // Start with the selector, then hold FASTER until 1200 rpm.
    await panel.setSelector('runSwitch', 1)
    await panel.waitFor((s) => /drive (speeding up|running)/.test(s))
    await panel.pressDevice('raiseButton')
    await panel.waitFor((s) => Number(/(\d+) rpm/.exec(s)?.[1]) >= 1150, 40_000)
    await panel.release()

    // Trim to within the objective's tolerance with short taps, as one would at the station.
    for (let i = 0; i < 20; i++) {
      await page.waitForTimeout(600)
      const rpm = await panel.rpm()
      if (Math.abs(rpm - 1200) <= 12) break
      await panel.pressDevice(rpm > 1200 ? 'lowerButton' : 'raiseButton')
      await page.waitForTimeout(Math.min(400, Math.abs(rpm - 1200) * 6))
      await panel.release()
    }
    await step(page, 'panel-commission-05-at-target')
    expect(Math.abs((await panel.rpm()) - 1200)).toBeLessThanOrEqual(20)

    // Hold for the objective's 10 s, with simulated time sped up ten times.
    await panel.setTimeSpeed(10)
    await page.waitForTimeout(2500)
    await panel.setTimeSpeed(1)

    // Lower a little, then stop by ramp with the selector.
    await panel.pressDevice('lowerButton')
    await page.waitForTimeout(2500)
    await panel.release()
    await panel.setSelector('runSwitch', 0)
    await panel.waitFor((s) => / 0 rpm/.test(s), 30_000)
    await step(page, 'panel-commission-06-stopped')

    const grade = await submitForGrade(page, 'panel-commission-07-graded')
    expect(grade).toMatch(/passed/)
    expect(grade).not.toMatch(/not passed/)
    // The grade links to its result page.
    await page.getByTestId('result-link').click()
    await page.waitForURL((u) => u.pathname.startsWith('/learn/attempts/'))
    await page.getByRole('heading', { name: 'Objectives' }).waitFor()
    expect(pageErrors).toEqual([])
  }, 300_000)
})
