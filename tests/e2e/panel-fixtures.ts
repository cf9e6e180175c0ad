// Shared set-up for the panel's browser tests: the app and a browser per test file, signing in,
// opening a scenario on the panel, and ready-made event logs of the raise/lower commissioning (what
// an apprentice's correct attempt records).
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { afterAll, beforeAll, expect } from 'vitest'
import type { Page } from 'playwright-core'
import type { AttemptEvent } from '../../shared/model/events'
import type { PanelDevice } from '../../src/simulator/scene/types'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { launchBrowser, screenshot, startApp, type BrowserSession, type RunningApp } from './support'
import { PanelDriver } from './panel-driver'
import type { StartWire } from './panel-observe'

export const APPRENTICE = DEMO_ACCOUNTS.find((a) => a.role === 'apprentice')!

export interface PanelTestBed {
  app: RunningApp
  browser: BrowserSession
}

/**
 * Starts the app and a browser before the file's tests and stops both after them. Call it inside the
 * `describe`; the fields are filled once `beforeAll` has run.
 */
export function panelTestBed(viewport: { width: number; height: number; hasTouch?: boolean }): PanelTestBed {
  const bed = {} as PanelTestBed
  beforeAll(async () => {
    bed.app = await startApp()
    bed.browser = await launchBrowser(viewport)
  })
  afterAll(async () => {
    await bed.browser?.close()
    await bed.app?.stop()
  })
  return bed
}

/** A scenario document from scenarios/, as the server seeds it. */
export function scenarioFile(
  key: string,
): { start: { devices: PanelDevice[]; wires?: StartWire[] } } & Record<string, unknown> {
  return JSON.parse(readFileSync(resolve(`scenarios/${key}.json`), 'utf8'))
}

export interface OpenPanel {
  page: Page
  panel: PanelDriver
  /** Uncaught errors on the page since it was opened. */
  pageErrors: string[]
}

/**
 * Signs the apprentice in, opens a scenario on the simulator (with an optional query such as
 * "?perf"), acknowledges the safety notice and waits until the panel has started.
 */
export async function openPanel(bed: PanelTestBed, scenarioKey: string, query = ''): Promise<OpenPanel> {
  const { page } = bed.browser
  await signInPage(page, bed.app.url)
  return openSignedIn(page, bed.app.url, scenarioKey, query)
}

/** `openPanel` for a page that is already signed in. */
export async function openSignedIn(
  page: Page,
  url: string,
  scenarioKey: string,
  query = '',
): Promise<OpenPanel> {
  const pageErrors: string[] = []
  page.on('pageerror', (e) => pageErrors.push(e.message))
  // Practice at the guided level unless the test chooses: only guided shows the Values tab these tests read.
  const level = /[?&]level=/.test(query) ? '' : `${query ? '&' : '?'}level=guided`
  await page.goto(`${url}/simulator/${scenarioKey}${query}${level}`)
  await dismissSafetyNotice(page)
  const { start } = scenarioFile(scenarioKey)
  const panel = new PanelDriver(page, start.devices, start.wires)
  try {
    await panel.ready()
  } catch (e) {
    throw new Error(`${(e as Error).message}\npage errors: ${pageErrors.join('\n') || 'none'}`)
  }
  // The tour opens with the panel, on the first run in this browser.
  await skipTour(page)
  return { page, panel, pageErrors }
}

export async function signInPage(page: Page, url: string) {
  await page.goto(url)
  await page
    .getByLabel(/e-mail/i)
    .first()
    .fill(APPRENTICE.email)
  await page
    .getByLabel(/password/i)
    .first()
    .fill(APPRENTICE.password)
  await page.getByRole('button', { name: /sign in/i }).click()
  await page.waitForURL((u) => !u.pathname.includes('sign-in'))
}

export async function apiToken(url: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: APPRENTICE.email, password: APPRENTICE.password }),
  })
  if (!res.ok) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`)
  return ((await res.json()) as { accessToken: string }).accessToken
}

export async function scenarioVersionId(url: string, token: string, key: string): Promise<string> {
  const res = await fetch(`${url}/api/scenarios/${key}`, { headers: { authorization: `Bearer ${token}` } })
  if (!res.ok) throw new Error(`scenario ${key}: ${res.status}`)
  return ((await res.json()) as { id: string }).id
}

/**
 * Submits the attempt from the Task tab (opening the task sheet if it is hidden), confirms, waits for the
 * server's grade, screenshots it and returns its text.
 */
export async function submitForGrade(page: Page, shot: string): Promise<string> {
  const toggle = page.getByTestId('toggle-sheet')
  if ((await toggle.getAttribute('aria-expanded')) !== 'true') await toggle.click()
  await page.getByRole('tab', { name: 'Task', exact: true }).click()
  await page.getByTestId('submit-attempt').click()
  await expect(page.getByTestId('attempts-remaining').textContent()).resolves.toMatch(/attempt/)
  await page.getByTestId('confirm-submit-button').click()
  const grade = page.getByTestId('attempt-grade')
  await grade.waitFor({ timeout: 30_000 })
  await grade.scrollIntoViewIfNeeded()
  await screenshot(page, shot)
  return (await grade.textContent()) ?? ''
}

/** Skips the workspace's first-run tour if it is shown, and waits until it has gone. */
export async function skipTour(page: Page) {
  const skip = page.getByTestId('tour-skip')
  const shown = await skip
    .click({ timeout: 5_000 })
    .then(() => true)
    .catch(() => false)
  if (shown) await skip.waitFor({ state: 'hidden', timeout: 15_000 })
}

/** Acknowledges the first-run safety notice if it is shown, and waits until it has gone. */
export async function dismissSafetyNotice(page: Page) {
  const understood = page.getByTestId('safety-understood')
  const shown = await understood
    .click({ timeout: 15_000 })
    .then(() => true)
    .catch(() => false)
  if (shown) await understood.waitFor({ state: 'hidden', timeout: 15_000 })
}

const wire = (t: number, id: string, from: string, to: string): AttemptEvent => ({
  t,
  type: 'wire.added',
  id,
  from,
  to,
  colour: 'blue',
})
const setting = (t: number, key: string, value: string): AttemptEvent[] => [
  { t, type: 'setting.changed', key, value } as AttemptEvent,
  { t, type: 'settings.saved' },
]

/**
 * My lock beside the supervisor's, proved dead, wired for sink logic, both locks off, programmed, started
 * and raised; the motor runs at the end. (The lock carries no tag, as logs written before tags.)
 */
export function raiseLowerRunningLog(): AttemptEvent[] {
  return [
    { t: 500, type: 'lock.applied' },
    { t: 1000, type: 'meter.probes', red: 'drive.l1', black: 'drive.l2' },
    { t: 2000, type: 'meter.probes', red: 'drive.l2', black: 'drive.l3' },
    { t: 3000, type: 'meter.probes', red: 'drive.l1', black: 'drive.l3' },
    { t: 4000, type: 'meter.probes', red: 'drive.dcp', black: 'drive.dcn' },
    { t: 5000, type: 'meter.probes', red: null, black: null },
    wire(10_000, 'w1', 'drive.p24', 'runSwitch.a'),
    wire(11_000, 'w2', 'runSwitch.a', 'raiseButton.a'),
    wire(12_000, 'w3', 'raiseButton.a', 'lowerButton.a'),
    wire(13_000, 'w4', 'runSwitch.b', 'drive.di1'),
    wire(14_000, 'w5', 'raiseButton.b', 'drive.di2'),
    wire(15_000, 'w6', 'lowerButton.b', 'drive.di3'),
    wire(16_000, 'w7', 'drive.dcom', 'drive.0v'),
    { t: 20_000, type: 'lock.removed' },
    { t: 20_500, type: 'supervisorLock.removed' },
    { t: 21_000, type: 'power.on' },
    ...setting(25_000, 'control.source', 'terminals'),
    ...setting(26_000, 'di1.function', 'run'),
    ...setting(27_000, 'di2.function', 'raise'),
    ...setting(28_000, 'di3.function', 'lower'),
    ...setting(29_000, 'reference.remoteSource', 'raiseLower'),
    { t: 30_000, type: 'device.switched', device: 'runSwitch', position: 1 },
    { t: 32_000, type: 'device.pressed', device: 'raiseButton' },
    { t: 47_000, type: 'device.released', device: 'raiseButton' },
  ]
}

/** The same attempt carried on: held, lowered, stopped by ramp. */
export function raiseLowerCompleteLog(): AttemptEvent[] {
  return [
    ...raiseLowerRunningLog(),
    { t: 60_000, type: 'device.pressed', device: 'lowerButton' },
    { t: 62_000, type: 'device.released', device: 'lowerButton' },
    { t: 64_000, type: 'device.switched', device: 'runSwitch', position: 0 },
    { t: 80_000, type: 'attempt.ended' },
  ]
}

/**
 * Records a diagnosis through the panel's dialog: the part typed into its list and the first match
 * picked, the finding picked from its list (both by their words on screen).
 */
export async function diagnose(page: Page, part: string, finding: string) {
  await page.getByRole('button', { name: 'Record diagnosis…' }).click()
  const dialog = page.getByTestId('diagnosis-dialog')
  await dialog.getByRole('combobox', { name: 'Which part' }).fill(part)
  await page
    .getByRole('option', { name: new RegExp(`^${part}`) })
    .first()
    .click()
  await dialog.getByTestId('diagnosis-finding').click()
  await page.getByRole('option', { name: finding }).click()
  await dialog.getByRole('button', { name: 'Record diagnosis' }).click()
  await dialog.waitFor({ state: 'hidden' })
}
