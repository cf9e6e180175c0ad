// An extension for one apprentice: from the cohort to the assignment page, the exception dialog and its
// confirmation; then the apprentice sees their own due date.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { collectErrors, demo, settled, signIn, signOut } from './client-steps'

describe('an extension for one apprentice', () => {
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

  it('gives a missed assignment a new due date for one apprentice, who then sees it as theirs', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('instructor'))
    await page.goto(`${app.url}/teach/cohorts`)
    await page
      .getByRole('link', { name: /Open cohort/ })
      .first()
      .click()
    await page.getByRole('tab', { name: /Assignments/ }).click()
    await page.locator('a[href^="/teach/assignments/"]').first().click()
    const missed = page.locator('[data-testid^="person-"]', { hasText: 'Missed' }).first()
    await missed.waitFor()
    const name = (await missed.locator('a').first().textContent())!.trim()
    const email = (await missed.locator('.text-break').textContent())!.trim()

    await missed.getByRole('button', { name: `Exception for ${name}` }).click()
    await page.getByLabel('Reason').fill('Off sick the week it was due')
    await page.getByRole('button', { name: 'Review and apply' }).click()
    await page.getByRole('button', { name: 'Apply', exact: true }).click()
    await page.getByText(`Exception saved for ${name}`).waitFor()
    const row = page.locator('[data-testid^="person-"]', { hasText: name })
    await expect.poll(() => row.textContent()).toMatch(/Own due date/)
    expect(await row.textContent()).toMatch(/Not started|Not passed/)
    expect(await row.textContent()).toContain('Off sick the week it was due')
    await settled(page)
    await screenshot(page, 'client-assignment-exception')

    await signOut(page)
    const apprentice = { ...demo('apprentice'), email }
    await signIn(page, app.url, apprentice)
    await page.getByText('(your own date)').first().waitFor()
    expect(errors).toEqual([])
  })
})
