// Sign-in, the role guard and the sign-in page's weight, in the built app with demo data.
import { readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { gzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { demo, settled, signIn, signOut } from './client-steps'

describe('signing in', () => {
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

  it('keeps the sign-in page small: no data table, charts, XState or Pixi (target under 150 KB gzipped)', async () => {
    const { page } = browser
    const scripts: string[] = []
    const listener = (response: { url(): string }) => {
      const url = new URL(response.url())
      if (url.pathname.endsWith('.js')) scripts.push(url.pathname)
    }
    page.on('response', listener)
    await page.goto(`${app.url}/sign-in`)
    await settled(page)
    page.off('response', listener)
    const dist = resolve('dist/client')
    const gzipped = scripts.reduce((sum, path) => sum + gzipSync(readFileSync(join(dist, path))).length, 0)
    console.log(`sign-in page: ${scripts.length} scripts, ${(gzipped / 1024).toFixed(1)} KB gzipped`)
    expect(scripts.some((s) => /Gradebook|SimulatorPanel|chart/i.test(s))).toBe(false)
    expect(gzipped).toBeLessThan(150 * 1024)
    await screenshot(page, 'client-signin')
  })

  it('says so when the password is wrong, and stays on sign-in', async () => {
    const { page } = browser
    await page.goto(`${app.url}/sign-in`)
    await page.getByLabel('E-mail').fill(demo('apprentice').email)
    await page.getByLabel('Password', { exact: true }).fill('not-the-demo-password')
    const refused = page.waitForResponse((r) => r.url().endsWith('/api/auth/sign-in'))
    await page.getByRole('button', { name: 'Sign in' }).click()
    expect((await refused).status()).toBe(401)
    await page
      .locator('.v-alert')
      .filter({ hasText: /password/i })
      .first()
      .waitFor()
    expect(new URL(page.url()).pathname).toBe('/sign-in')
    await screenshot(page, 'client-signin-error')
  })

  it('brings a signed-out visitor back to the page they asked for', async () => {
    const { page } = browser
    await page.goto(`${app.url}/learn/attempts`)
    await page.waitForURL((url) => url.pathname === '/sign-in')
    expect(new URL(page.url()).searchParams.get('redirect')).toBe('/learn/attempts')
    const apprentice = demo('apprentice')
    await page.getByLabel('E-mail').fill(apprentice.email)
    await page.getByLabel('Password', { exact: true }).fill(apprentice.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL((url) => url.pathname === '/learn/attempts')
    await page.getByRole('heading', { name: 'My attempts' }).waitFor()
  })

  it('shows an apprentice who types an instructor address a clear "not allowed" page', async () => {
    const { page } = browser
    await page.goto(`${app.url}/teach/gradebook`)
    await page.getByText('Not allowed').waitFor()
    expect(new URL(page.url()).pathname).toBe('/forbidden')
    await screenshot(page, 'client-forbidden')
  })

  it('opens the apprentice home with the assigned exercises', async () => {
    const { page } = browser
    await page.goto(`${app.url}/`)
    await page.waitForURL((url) => url.pathname === '/learn')
    await settled(page)
    await page.getByRole('heading', { name: /Hello/ }).waitFor()
    await screenshot(page, 'client-apprentice-home')
  })

  it('signs out from the account menu and protects the pages again', async () => {
    const { page } = browser
    await signOut(page)
    await page.goto(`${app.url}/learn`)
    await page.waitForURL((url) => url.pathname === '/sign-in')
  })

  it('lands each staff role on its own start page', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('instructor'))
    // An instructor's home is what needs attention.
    expect(new URL(page.url()).pathname).toBe('/teach')
    await signOut(page)
    await signIn(page, app.url, demo('admin'))
    expect(new URL(page.url()).pathname).toBe('/admin/users')
  })
})

describe('after a deploy', () => {
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

  it('reloads the page when a lazy screen’s chunk is missing, instead of showing a blank screen', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('apprentice'))
    // The first request for the practice screen's chunk fails, as it would once a new build replaced it.
    let refused = 0
    await page.route(/\/assets\/PracticeView-[^/]+\.js$/, async (route) => {
      if (refused++ === 0) return route.abort()
      return route.continue()
    })
    const reloaded = page.waitForEvent('load')
    await page.getByRole('link', { name: 'Free practice' }).first().click()
    await reloaded
    await page.getByRole('heading', { name: 'Free practice' }).waitFor()
    expect(refused).toBeGreaterThanOrEqual(2)
    expect(new URL(page.url()).pathname).toBe('/learn/practice')
  })
})
