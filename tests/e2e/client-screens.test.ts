// Every main screen, opened as its user would, saved as a screenshot to look at; also on a tablet
// (768 px) and in the dark theme. Each screen must render without errors and without sideways scrolling.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { collectErrors, demo, settled, signIn, signOut } from './client-steps'

async function noSidewaysScroll(page: Page) {
  const { scroll, width } = await page.evaluate(() => ({
    scroll: document.documentElement.scrollWidth,
    width: document.documentElement.clientWidth,
  }))
  expect(scroll, `page wider than the window at ${page.url()}`).toBeLessThanOrEqual(width + 1)
}

async function visit(page: Page, url: string, heading: RegExp | string, shot: string) {
  await page.goto(url)
  await page.getByRole('heading', { name: heading }).first().waitFor()
  await settled(page)
  await noSidewaysScroll(page)
  await screenshot(page, shot)
}

describe('every main screen', () => {
  let app: RunningApp
  let browser: BrowserSession
  let errors: string[]

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser()
    errors = collectErrors(browser.page)
  })
  beforeEach(({ onTestFailed, task }) => {
    onTestFailed(async () => {
      await screenshot(browser.page, `failed-${task.name.slice(0, 30).replace(/\W+/g, '-')}`)
    })
  })
  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('apprentice: practice, attempts, an attempt result, profile, about', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('apprentice'))
    await visit(page, `${app.url}/learn/practice`, 'Free practice', 'client-practice')
    await visit(page, `${app.url}/learn/attempts`, 'My attempts', 'client-attempt-history')
    await page.getByRole('link', { name: 'Details' }).first().click()
    await page.getByRole('heading', { name: 'Objectives' }).waitFor()
    await settled(page)
    await screenshot(page, 'client-attempt-result')
    await visit(page, `${app.url}/profile`, 'Profile', 'client-profile')
    await visit(page, `${app.url}/about`, 'About Slipway', 'client-about')
    expect(await page.getByText(/DC bus capacitors/).count()).toBeGreaterThan(0)
  })

  it('apprentice: the simulator shows the safety notice on its first run, then the panel', async () => {
    const { page } = browser
    await page.goto(`${app.url}/learn`)
    await page
      .getByRole('link', { name: /Start|Resume|Try again/ })
      .first()
      .click()
    await page.waitForURL((url) => url.pathname.startsWith('/simulator/'))
    const notice = page.getByRole('dialog')
    await notice.getByText(/lockout\/tagout/).waitFor()
    await expect(
      notice.getByText(/DC bus capacitors in a drive hold a lethal charge/).isVisible(),
    ).resolves.toBe(true)
    await screenshot(page, 'client-simulator-safety')
    await page.getByTestId('safety-understood').click()
    await page.getByTestId('safety-understood').waitFor({ state: 'hidden' })
    // Then a short tour of the workspace, once.
    await page.getByTestId('first-run-tour').waitFor()
    await screenshot(page, 'client-simulator-tour')
    await page.getByTestId('tour-skip').click()
    await notice.waitFor({ state: 'hidden' })
    await settled(page)
    await screenshot(page, 'client-simulator')
    // Acknowledged once, it does not come back on the next visit.
    await page.reload()
    await page.locator('[data-testid="simulator-slot"]').waitFor()
    await page.waitForTimeout(500)
    expect(await page.getByTestId('safety-understood').count()).toBe(0)
    expect(await page.getByTestId('first-run-tour').count()).toBe(0)
  })

  it('instructor: cohorts, assigning a scenario, the scenario library, a scenario, the editor', async () => {
    const { page } = browser
    await page.goto(`${app.url}/profile`)
    await signOut(page)
    await signIn(page, app.url, demo('instructor'))
    await visit(page, `${app.url}/teach/cohorts`, 'Cohorts', 'client-cohorts')
    await page
      .getByRole('link', { name: /Open cohort/ })
      .first()
      .click()
    await page.getByRole('link', { name: 'Assign a scenario' }).click()
    await page.getByRole('heading', { name: 'Assign a scenario' }).waitFor()
    await settled(page)
    await screenshot(page, 'client-assign-scenario')
    // Assign one for real: it appears on the cohort's assignments tab and can be changed there.
    await page.locator('[data-testid="assign-scenario"]').click()
    await page.getByRole('option', { name: /Speed potentiometer/ }).click()
    await page.getByRole('button', { name: 'Assign', exact: true }).click()
    await page.waitForURL((url) => /^\/teach\/cohorts\/[^/]+$/.test(url.pathname))
    await page.getByRole('tab', { name: /Assignments/ }).click()
    await page.getByRole('button', { name: /Change Speed potentiometer/ }).click()
    await page.getByRole('dialog').getByLabel('Due', { exact: true }).waitFor()
    await settled(page)
    await screenshot(page, 'client-edit-assignment')
    await page.getByRole('dialog').getByRole('button', { name: 'Cancel' }).click()
    await visit(page, `${app.url}/scenarios`, 'Scenario library', 'client-scenario-library')
    await visit(
      page,
      `${app.url}/scenarios/raise-lower-commissioning`,
      /Commission/,
      'client-scenario-detail',
    )
    await visit(
      page,
      `${app.url}/scenarios/raise-lower-commissioning/edit`,
      'Edit scenario',
      'client-scenario-editor',
    )
    // Live validation by the shared scenario checker: an empty title is listed at once, in words, and
    // shown under the field once the author leaves it.
    await page.getByLabel('Title', { exact: true }).fill('')
    await page.getByText('1 thing to put right').waitFor()
    await page.getByLabel('Title', { exact: true }).blur()
    await page.getByText('Write at least 3 characters').first().waitFor()
    // Forms only: no JSON and no JSON path anywhere on the editor.
    await expect(page.locator('main').innerText()).resolves.not.toMatch(/\$\.|\{\s*"/)
    await screenshot(page, 'client-scenario-editor-problem')
    // Leaving with unsaved changes asks first; leaving anyway drops them.
    await page.getByRole('link', { name: 'Back to the scenario' }).click()
    await page.getByRole('alertdialog').getByText('Leave without saving?').waitFor()
    await page.getByRole('alertdialog').getByRole('button', { name: 'Leave' }).click()
    await page.waitForURL((url) => url.pathname === '/scenarios/raise-lower-commissioning')
  })

  it('admin: users and roles, the outbox, the backup', async () => {
    const { page } = browser
    await signOut(page)
    await signIn(page, app.url, demo('admin'))
    await visit(page, `${app.url}/admin/users`, 'Users and roles', 'client-admin-users')
    // A role change is confirmed first, then saved.
    await page
      .getByRole('row', { name: /Zofia Brennock/ })
      .locator('.v-select .v-field')
      .click()
    await page.getByRole('option', { name: 'Instructor' }).click()
    await page
      .getByRole('alertdialog')
      .getByText(/Zofia Brennock becomes instructor/)
      .waitFor()
    await page.getByRole('alertdialog').getByRole('button', { name: 'Apply' }).click()
    await page.getByText('Account updated').waitFor()
    await visit(page, `${app.url}/admin/outbox`, 'Mail outbox', 'client-admin-outbox')
    await visit(page, `${app.url}/admin/backup`, 'Database backup', 'client-admin-backup')
    const download = page.waitForEvent('download')
    await page.getByRole('button', { name: 'Download a backup' }).click()
    const file = await download
    expect(file.suggestedFilename()).toMatch(/^slipway-backup-.*\.sqlite$/)
    // A SQLite database file starts with this 16-byte header (sqlite.org file format, section 1.3).
    const { readFileSync } = await import('node:fs')
    expect(
      readFileSync(await file.path())
        .subarray(0, 16)
        .toString('latin1'),
    ).toBe('SQLite format 3\u0000')
    expect(errors).toEqual([])
  })
})

describe('on a tablet and in the dark theme', () => {
  let app: RunningApp
  let browser: BrowserSession

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser({ width: 768, height: 1024, colorScheme: 'dark' })
  })
  beforeEach(({ onTestFailed, task }) => {
    onTestFailed(async () => {
      await screenshot(browser.page, `failed-${task.name.slice(0, 30).replace(/\W+/g, '-')}`)
    })
  })
  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('keeps the apprentice home and the simulator usable at 768 px', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('apprentice'))
    await visit(page, `${app.url}/learn`, /Hello/, 'client-tablet-apprentice-home')
    await visit(page, `${app.url}/learn/attempts`, 'My attempts', 'client-tablet-attempt-history')
  })

  it('keeps the gradebook and the cohort page usable at 768 px', async () => {
    const { page } = browser
    await signOut(page)
    await signIn(page, app.url, demo('instructor'))
    await visit(page, `${app.url}/teach/gradebook`, 'Gradebook', 'client-tablet-gradebook')
    await visit(page, `${app.url}/teach/cohorts`, 'Cohorts', 'client-tablet-cohorts')
    await page
      .getByRole('link', { name: /Open cohort/ })
      .first()
      .click()
    await page.getByRole('tab', { name: /Members/ }).waitFor()
    await settled(page)
    await noSidewaysScroll(page)
    await screenshot(page, 'client-tablet-cohort-detail')
  })
})
