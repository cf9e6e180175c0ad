// Steps the client's browser tests share: signing in as a demo user, waiting for a screen to settle.
import type { Page } from 'playwright-core'
import { DEMO_ACCOUNTS, type DemoAccount } from '../../server/demo/demo-accounts'
import { networkQuiet } from './support/browser'

export function demo(role: DemoAccount['role'], index = 0): DemoAccount {
  const account = DEMO_ACCOUNTS.filter((a) => a.role === role)[index]
  if (!account) throw new Error(`No demo ${role} #${index}`)
  return account
}

export async function signIn(page: Page, baseUrl: string, account: DemoAccount) {
  await page.goto(`${baseUrl}/sign-in`)
  await page.getByLabel('E-mail').fill(account.email)
  await page.getByLabel('Password', { exact: true }).fill(account.password)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'))
}

/** Waits until no spinner is showing, so screenshots show data, not loading states. */
export async function settled(page: Page) {
  // Not Playwright's `networkidle`: the live classroom's event streams never end (see networkQuiet).
  await page.waitForLoadState('load')
  await networkQuiet(page)
  await page
    .locator('[role="status"] .v-progress-circular')
    .first()
    .waitFor({ state: 'detached', timeout: 10_000 })
    .catch(() => {})
  // Let transitions (dialogs, menus) finish.
  await page.waitForTimeout(300)
}

/** Console errors and page errors, apart from the expected 401 of a refused session refresh. */
export function collectErrors(page: Page) {
  const errors: string[] = []
  page.on('pageerror', (e) => errors.push(`pageerror: ${e.message}`))
  page.on('console', (m) => {
    if (m.type() !== 'error' || /status of 40[13]/.test(m.text())) return
    // "No draft yet" is a 404 by contract (shared/api/scenarioAuthoring.ts): the editor then starts one.
    if (/status of 404/.test(m.text()) && /\/api\/scenarios\/[^/]+\/draft$/.test(m.location().url)) return
    errors.push(m.text())
  })
  return errors
}

export async function signOut(page: Page) {
  await page.getByRole('button', { name: 'Account menu' }).click()
  await page.getByText('Sign out', { exact: true }).click()
  await page.waitForURL((url) => url.pathname === '/sign-in')
}
