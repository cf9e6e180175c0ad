// The gradebook: server-side sorting, filtering and paging, CSV export, the histogram, and the way
// from a score to the attempt review (feedback and a grade override).
import { readFileSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { parse } from 'csv-parse/sync'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { collectErrors, demo, settled, signIn } from './client-steps'

describe('the gradebook', () => {
  let app: RunningApp
  let browser: BrowserSession
  let errors: string[]

  const firstNames = (page: BrowserSession['page']) =>
    page.locator('[data-testid="gradebook-table"] tbody tr td:first-child .apprentice-link').allTextContents()

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser()
    errors = collectErrors(browser.page)
  })
  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('lists the cohort’s apprentices sorted by name', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('instructor'))
    await page.getByRole('link', { name: 'Gradebook' }).first().click()
    await page.locator('[data-testid="gradebook-table"] tbody tr').first().waitFor()
    await settled(page)
    const names = await firstNames(page)
    expect(names.length).toBeGreaterThan(1)
    expect(names).toEqual([...names].sort((a, b) => a.localeCompare(b)))
    await screenshot(page, 'client-gradebook')
  })

  it('asks the server for the reverse order when the name column is sorted again', async () => {
    const { page } = browser
    const before = await firstNames(page)
    const reply = page.waitForResponse(
      (r) => r.url().includes('/gradebook?') && r.url().includes('order=desc'),
    )
    await page.getByRole('columnheader', { name: /Apprentice/ }).click()
    await reply
    await settled(page)
    expect(await firstNames(page)).toEqual([...before].reverse())
  })

  it('sorts by average on the server', async () => {
    const { page } = browser
    const reply = page.waitForResponse((r) => r.url().includes('sort=average'))
    await page.getByRole('columnheader', { name: /Average/ }).click()
    const body = (await (await reply).json()) as { rows: { average: number | null }[] }
    // Where apprentices without any score go is the server's choice; the scored ones must be ascending.
    const averages = body.rows.map((r) => r.average).filter((a): a is number => a !== null)
    expect(averages.length).toBeGreaterThan(1)
    expect(averages).toEqual([...averages].sort((a, b) => a - b))
  })

  it('filters by name on the server', async () => {
    const { page } = browser
    const ravi = demo('apprentice')
    const reply = page.waitForResponse((r) => r.url().includes('/gradebook?') && r.url().includes('q=Ravi'))
    await page.getByLabel('Search name or e-mail', { exact: true }).fill('Ravi')
    await reply
    await settled(page)
    expect(await firstNames(page)).toEqual([ravi.name])
    await page.getByLabel('Search name or e-mail', { exact: true }).fill('')
    await settled(page)
  })

  it('exports the gradebook as CSV with a header row and one line per apprentice', async () => {
    const { page } = browser
    const download = page.waitForEvent('download')
    await page.getByRole('button', { name: 'Export CSV' }).click()
    // The export asks whether the file holds every apprentice or only the rows shown.
    await page.getByText('Every apprentice', { exact: true }).click()
    const file = await download
    expect(file.suggestedFilename()).toMatch(/^gradebook-.*\.csv$/)
    const path = await file.path()
    // csv-parse (not our code) reads it back: a well-formed file with the apprentices in it.
    const records: string[][] = parse(readFileSync(path, 'utf8'), { bom: true })
    expect(records[0].map((h) => h.toLowerCase()).join(' ')).toMatch(/name/)
    const total = Number(
      (await page.locator('.v-data-table-footer__info').textContent())?.match(/of (\d+)/)?.[1],
    )
    expect(records.length - 1).toBe(total)
    expect(records.flat()).toContain(demo('apprentice').email)
  })

  it('draws the score histogram of an assignment', async () => {
    const { page } = browser
    const card = page.locator('[data-testid="stats-card"]')
    await card.scrollIntoViewIfNeeded()
    await card.locator('canvas').waitFor()
    await expect(card.getByText('Median').isVisible()).resolves.toBe(true)
    await screenshot(page, 'client-gradebook-histogram')
  })

  it('opens an attempt from a score, takes feedback and records a grade override', async () => {
    const { page } = browser
    const scored = page.locator('[data-testid="gradebook-table"] button.cell-btn:not([disabled])').first()
    await scored.click()
    await page.getByRole('dialog').locator('a.v-list-item').first().click()
    await page.waitForURL((url) => url.pathname.startsWith('/teach/attempts/'))
    await page.getByRole('heading', { name: 'Objectives' }).waitFor()
    await settled(page)
    await screenshot(page, 'client-attempt-review')

    await page
      .getByLabel('Feedback for the apprentice')
      .fill('Good isolation. Next time prove the meter first.')
    await page.getByRole('button', { name: 'Send feedback' }).click()
    await page.getByText('Good isolation. Next time prove the meter first.').first().waitFor()

    await page.getByLabel('Score (0–100)').fill('64')
    await page
      .getByLabel('Reason for the change')
      .fill('Bench meter had a flat battery; the apprentice did prove it on a second meter.')
    await page.getByRole('button', { name: 'Override the grade' }).click()
    await page.getByRole('alertdialog').getByRole('button', { name: 'Override' }).click()
    await page.getByText('Bench meter had a flat battery', { exact: false }).last().waitFor()
    await page
      .getByText(/Overridden by/)
      .first()
      .waitFor()
    await settled(page)
    await screenshot(page, 'client-attempt-review-overridden')
    expect(errors).toEqual([])
  })
})
