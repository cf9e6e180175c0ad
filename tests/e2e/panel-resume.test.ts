// One attempt on two computers (two browser profiles): saved on the server from a laptop, resumed on
// a phone, where a wire is added by touch (tap, tap); the laptop's next save is refused because the
// server holds actions its copy lacks, and it loads the newer copy. Saves only ever append.
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { TERMINAL_LABEL_SIZE } from '../../src/simulator/scene/layout'
import { launchBrowser, screenshot } from './support'
import {
  dismissSafetyNotice,
  openPanel,
  panelTestBed,
  scenarioFile,
  signInPage,
  skipTour,
} from './panel-fixtures'
import { PanelDriver } from './panel-driver'

const SCENARIO = 'raise-lower-commissioning'

/** Saves on the server from the Task tab and waits until the page says how many actions are saved. */
async function saveNow(panel: PanelDriver, actions: number) {
  await panel.openSheet('Task')
  await panel.page.getByTestId('save-now').click()
  await expect
    .poll(() => panel.page.getByTestId('save-status').textContent(), { timeout: 15_000 })
    .toMatch(new RegExp(`Saved on the server \\(${actions} actions\\)`))
}

async function canvasScale(page: Page): Promise<number> {
  return Number(await page.getByTestId('panel-canvas').getAttribute('data-scale'))
}

describe('an attempt on two computers', () => {
  const bed = panelTestBed({ width: 1366, height: 768 })

  it('resumes on another computer, and the first one loads the newer copy instead of overwriting it', async () => {
    // The laptop: at fit, terminal labels read at 11 CSS px or more.
    const laptop = await openPanel(bed, SCENARIO)
    expect((await canvasScale(laptop.page)) * TERMINAL_LABEL_SIZE).toBeGreaterThanOrEqual(11)
    await laptop.panel.applyLock()
    await saveNow(laptop.panel, 1)
    await laptop.panel.closeSheet()
    await screenshot(laptop.page, 'panel-resume-01-laptop-saved')

    // The phone: a second browser profile with a touch screen is offered the attempt saved on the server.
    const phone = await launchBrowser({ width: 390, height: 844, hasTouch: true })
    try {
      const page = phone.page
      await signInPage(page, bed.app.url)
      await page.goto(`${bed.app.url}/simulator/${SCENARIO}`)
      await dismissSafetyNotice(page)
      const offer = page.getByTestId('resume-choice')
      await offer.waitFor({ timeout: 30_000 })
      await expect(offer.textContent()).resolves.toMatch(/1 action, saved on the server/)
      await screenshot(page, 'panel-resume-02-phone-offer')
      await page.getByTestId('resume-choice-0').click()
      const panel = new PanelDriver(page, scenarioFile(SCENARIO).start.devices)
      await panel.ready()
      await skipTour(page)
      expect(await panel.state.isolation()).toBe('disconnect off and locked')
      await expect(page.getByText(/made for a screen at least 768 px wide/).count()).resolves.toBe(1)

      // Practice works by touch: tap one terminal, then the other.
      await panel.wire('drive.dcom', 'drive.0v', 'touch')
      await screenshot(page, 'panel-resume-03-phone-wired-by-touch')
      expect(
        await page.evaluate(
          () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
        ),
      ).toBeLessThanOrEqual(1)
      await saveNow(panel, 2)

      // Back on the laptop, which still holds the older copy: its next save is refused, and it offers the newer.
      await laptop.panel.removeLock()
      await laptop.panel.openSheet('Task')
      await laptop.page.getByTestId('save-now').click()
      const conflict = laptop.page.getByTestId('attempt-conflict')
      await conflict.waitFor({ timeout: 15_000 })
      await expect(conflict.textContent()).resolves.toMatch(/continued on another computer/)
      await screenshot(laptop.page, 'panel-resume-04-laptop-conflict')
      await laptop.page.getByTestId('load-newer-copy').click()
      await conflict.waitFor({ state: 'hidden' })
      await laptop.panel.waitFor((s) => s.includes('1 wires, disconnect off and locked.'))
      expect(await laptop.panel.state.wires()).toEqual(['DIC → 0V'])
      await screenshot(laptop.page, 'panel-resume-05-laptop-newer-copy')
    } finally {
      await phone.close()
    }
  }, 240_000)
})
