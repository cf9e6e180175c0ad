// The library's filters and "Assign", a cohort's insight and practice policy, and what an apprentice then
// sees on the practice page: one pass through the screens of #16 items 7, 8 and 11.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { collectErrors, demo, settled, signIn, signOut } from './client-steps'

describe('library, insight and practice', () => {
  let app: RunningApp
  let browser: BrowserSession
  let errors: string[]

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser()
    errors = collectErrors(browser.page)
  })
  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('filters the library by difficulty and assigns a scenario from its page', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('instructor'))
    await page.getByRole('link', { name: 'Scenario library' }).first().click()
    const cards = page.locator('a.v-card .v-card-title')
    await page.locator('[data-testid="library-count"]').waitFor()
    await settled(page)
    const titles = await cards.allTextContents()
    expect(titles.length).toBeGreaterThan(3)
    expect(titles).toEqual([...titles].sort((a, b) => a.localeCompare(b, 'en', { sensitivity: 'base' })))

    await page.locator('[data-testid="library-difficulty"] .v-field').click()
    await page.getByRole('option', { name: 'Advanced' }).click()
    await expect.poll(() => cards.count()).toBeLessThan(titles.length)
    await expect(page.getByText('Introductory ·', { exact: false }).count()).resolves.toBe(0)

    const title = (await cards.first().textContent())!.trim()
    await cards.first().click()
    await page.getByRole('button', { name: 'Assign' }).click()
    // The demo instructor teaches one cohort: it is chosen already.
    await page.getByRole('dialog').getByRole('button', { name: 'Continue' }).click()
    await page.waitForURL((url) => /\/teach\/cohorts\/[^/]+\/assign/.test(url.pathname))
    await expect.poll(() => page.locator('[data-testid="assign-scenario"]').textContent()).toContain(title)
  })

  it('sorts an assignment column with Space and Enter, and gives the focus back when the attempts close', async () => {
    const { page } = browser
    await page.getByRole('link', { name: 'Gradebook' }).first().click()
    await page.locator('[data-testid="gradebook-table"] tbody tr').first().waitFor()
    await settled(page)
    const header = page.locator('th.v-data-table__th--sortable').filter({ hasText: 'Due' }).first()
    await header.focus()
    const bySpace = page.waitForResponse((r) => /\/gradebook\?.*sort=[0-9a-f-]{36}.*order=asc/.test(r.url()))
    await page.keyboard.press(' ')
    await bySpace
    const byEnter = page.waitForResponse((r) => /\/gradebook\?.*sort=[0-9a-f-]{36}.*order=desc/.test(r.url()))
    await page.keyboard.press('Enter')
    await byEnter
    await settled(page)

    const cell = page.locator('[data-testid="gradebook-table"] button.cell-btn:not([disabled])').first()
    await cell.focus()
    await page.keyboard.press('Enter')
    await page.getByRole('dialog').waitFor()
    await page.keyboard.press('Escape')
    await page.getByRole('dialog').waitFor({ state: 'detached' })
    await expect.poll(() => cell.evaluate((el) => el === document.activeElement)).toBe(true)
  })

  it('shows the cohort’s insight and closes a scenario for practice, which its apprentices then miss', async () => {
    const { page } = browser
    await page.getByRole('link', { name: 'Cohorts' }).first().click()
    await page.locator('a[href^="/teach/cohorts/"]').first().click()
    await page.getByRole('tab', { name: 'Insight' }).click()
    await page.locator('[data-testid="cohort-insight-standing"] canvas').first().waitFor()
    await settled(page)
    await screenshot(page, 'client-cohort-insight')

    await page.getByRole('tab', { name: 'Practice' }).click()
    const firstSwitch = page.locator('[data-testid="practice-policy"] input[type="checkbox"]').first()
    const name = (await firstSwitch.getAttribute('aria-label'))!.replace(': open for practice', '')
    await firstSwitch.click()
    await page.getByText(`“${name}” is closed for practice`).waitFor()
    await page.getByText(/scenarios are open/).waitFor()

    await signOut(page)
    await signIn(page, app.url, demo('apprentice'))
    await page.goto(`${app.url}/learn/practice`)
    await page.locator('[data-testid="practice-closed"]').waitFor()
    await page
      .getByRole('link', { name: /^Practise / })
      .first()
      .waitFor()
    await expect(page.getByRole('link', { name: `Practise ${name}` }).count()).resolves.toBe(0)
    expect(errors).toEqual([])
  })
})
