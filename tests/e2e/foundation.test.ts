// The foundation's promise: the built app comes up on one port with demo data and a demo user can sign in.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'

describe('the built app', () => {
  let app: RunningApp
  let browser: BrowserSession

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser()
  })

  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('reports its version and a healthy database', async () => {
    const response = await fetch(`${app.url}/api/health`)
    const body = (await response.json()) as { version: unknown; database: { ok: boolean } }
    expect(response.status).toBe(200)
    expect(body.database.ok).toBe(true)
    expect(typeof body.version).toBe('string')
  })

  it('renders the sign-in page in the bundled Atkinson Hyperlegible font', async () => {
    const { page } = browser
    await page.goto(app.url)
    await page.getByLabel(/e-mail/i).first().waitFor()
    const fontFamily = await page.evaluate(() => getComputedStyle(document.body).fontFamily)
    expect(fontFamily).toMatch(/Atkinson Hyperlegible/)
    // The face must come from our own server (no CDN), and must have actually loaded.
    const loaded = await page.evaluate(async () => {
      await document.fonts.ready
      return [...document.fonts].filter((f) => f.family.includes('Atkinson') && f.status === 'loaded').length
    })
    expect(loaded).toBeGreaterThan(0)
    await screenshot(page, 'foundation-signin')
  })

  it('signs a demo apprentice in and shows their landing page', async () => {
    const { page } = browser
    const apprentice = DEMO_ACCOUNTS.find((account) => account.role === 'apprentice')
    expect(apprentice).toBeDefined()
    await page.goto(app.url)
    await page.getByLabel(/e-mail/i).first().fill(apprentice!.email)
    await page.getByLabel(/password/i).first().fill(apprentice!.password)
    await page.getByRole('button', { name: /sign in/i }).click()
    await page.waitForURL((url) => !url.pathname.includes('sign-in'))
    await expect(page.getByText(apprentice!.name.split(' ')[0]!).first().isVisible()).resolves.toBe(true)
    await screenshot(page, 'foundation-landing')
  })
})
