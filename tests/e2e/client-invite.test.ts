// An instructor invites an apprentice; the admin reads the invitation in the outbox; the invitee joins.
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { collectErrors, demo, settled, signIn, signOut } from './client-steps'

const invitee = { name: 'Tamsin Oduya', email: 'tamsin.oduya@kestrelvale.example' }

describe('inviting an apprentice by e-mail', () => {
  let app: RunningApp
  let browser: BrowserSession
  let errors: string[]
  let invitationLink = ''

  beforeAll(async () => {
    app = await startApp()
    browser = await launchBrowser()
    errors = collectErrors(browser.page)
  })
  afterAll(async () => {
    await browser?.close()
    await app?.stop()
  })

  it('lets the instructor invite from the cohort page', async () => {
    const { page } = browser
    await signIn(page, app.url, demo('instructor'))
    // The instructor's home is what needs attention; the cohorts are one link away.
    await page.goto(`${app.url}/teach/cohorts`)
    await page
      .getByRole('link', { name: /Open cohort/ })
      .first()
      .click()
    await page.getByRole('tab', { name: /Members/ }).waitFor()
    await settled(page)
    await screenshot(page, 'client-cohort-detail')
    await page.getByRole('button', { name: 'Invite', exact: true }).click()
    const dialog = page.getByRole('dialog')
    await dialog.getByLabel('Name').fill(invitee.name)
    await dialog.getByLabel('E-mail').fill(invitee.email)
    await screenshot(page, 'client-invite-dialog')
    await dialog.getByRole('button', { name: 'Send invitation' }).click()
    await page.getByText(`Invitation sent to ${invitee.email}`).waitFor()
    await page.getByRole('tab', { name: /Pending invitations \(1\)/ }).click()
    await page.getByRole('cell', { name: invitee.email }).waitFor()
  })

  it('previews a roster with a bad row, refuses it whole, and imports the valid rows', async () => {
    const { page } = browser
    const dir = mkdtempSync(join(tmpdir(), 'slipway-roster-'))
    const file = join(dir, 'roster.csv')
    writeFileSync(
      file,
      'name,email\nBryn Castellan,bryn.castellan@kestrelvale.example\nNo Address,not-an-address\n',
    )
    await page.getByRole('button', { name: 'Upload roster' }).click()
    await page.locator('[data-testid="roster-file"] input[type="file"]').setInputFiles(file)
    const preview = page.locator('[data-testid="roster-preview"]')
    await preview.getByText('Must be an e-mail address').waitFor()
    await expect(page.getByRole('button', { name: 'Invite every row' }).isDisabled()).resolves.toBe(true)
    await page.getByText('Up to 500 rows').waitFor()
    await screenshot(page, 'client-roster-preview')
    await page.getByRole('button', { name: 'Import the valid rows (1)' }).click()
    await page.getByText('Roster imported: 1 invited, 0 enrolled, 1 row left out').waitFor()
    await page.getByRole('tab', { name: /Pending invitations \(2\)/ }).waitFor()
  })

  it('withdraws an invitation after asking', async () => {
    const { page } = browser
    await page.getByRole('cell', { name: 'bryn.castellan@kestrelvale.example' }).waitFor()
    await screenshot(page, 'client-pending-invitations')
    await page.getByRole('button', { name: 'Withdraw the invitation to Bryn Castellan' }).click()
    const confirm = page.getByRole('alertdialog')
    await confirm.getByText('Withdraw this invitation?').waitFor()
    await confirm.getByRole('button', { name: 'Withdraw' }).click()
    await page.getByText('Invitation for bryn.castellan@kestrelvale.example withdrawn').waitFor()
    await page.getByRole('tab', { name: /Pending invitations \(1\)/ }).waitFor()
  })

  it('lists the pending invitation for the admin', async () => {
    const { page } = browser
    await signOut(page)
    await signIn(page, app.url, demo('admin'))
    await page.goto(`${app.url}/admin/users`)
    const pending = page.locator('[data-test="pending-invitations"]')
    await pending.getByText(invitee.email).waitFor()
    await screenshot(page, 'client-admin-pending-invitations')
  })

  it('shows the admin the invitation e-mail in the outbox, with its link', async () => {
    const { page } = browser
    await page.getByRole('link', { name: 'Mail outbox' }).click()
    // Mail goes out over SMTP after the request; give the embedded relay a moment.
    await expect
      .poll(
        async () => {
          await page.getByRole('button', { name: 'Refresh' }).click()
          await settled(page)
          return page.getByText(`To ${invitee.email}`).count()
        },
        { timeout: 20_000 },
      )
      .toBeGreaterThan(0)
    await screenshot(page, 'client-outbox')
    await page.getByText(`To ${invitee.email}`).first().click()
    const message = page.locator('[data-testid="mail-message"]')
    await message.waitFor()
    const link = message.locator('a[href*="/invitation"]').first()
    invitationLink = (await link.getAttribute('href')) ?? ''
    expect(invitationLink).toContain('token=')
    await screenshot(page, 'client-outbox-message')
  })

  it('lets the invitee set a password from the link and land on their home', async () => {
    const { page } = browser
    await page.keyboard.press('Escape')
    await signOut(page)
    await page.goto(invitationLink)
    await page.getByText(invitee.email).first().waitFor()
    await page.getByLabel('New password', { exact: true }).fill('lamp post river slate')
    await page.getByLabel('Repeat the new password').fill('lamp post river slate')
    await screenshot(page, 'client-accept-invitation')
    await page.getByRole('button', { name: 'Create my account' }).click()
    await page.waitForURL((url) => url.pathname === '/learn')
    await page.getByRole('heading', { name: `Hello, ${invitee.name}` }).waitFor()
    expect(errors).toEqual([])
  })
})
