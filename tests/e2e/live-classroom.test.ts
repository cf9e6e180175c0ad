// The live classroom with two browsers: the apprentice wires on their panel, the instructor sees the panel
// in the class view and watches it, puts a broken conductor into the bench and sends a hint; the apprentice
// sees the hint and that they are watched, and the injection comes back into their log (the watch view's
// timeline names it). The apprentice finds the wire by measurement, diagnoses it, repairs it under lockout
// and submits: the grade has the injected fault's objectives met, the instructor's replay names the fault.
// The watcher sees the attempt end. Screenshots of the three screens at three sizes, under test-results/live-shots/.
import { mkdirSync } from 'node:fs'
import AxeBuilder from '@axe-core/playwright'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { DEMO_ACCOUNTS, DEMO_COHORTS } from '../../server/demo/demo-accounts'
import { launchBrowser, startApp, type BrowserSession, type RunningApp } from './support'
import type { ObjectiveResult } from '../../shared/api/grading'
import {
  APPRENTICE,
  apiToken,
  diagnose,
  openPanel,
  submitForGrade,
  type PanelTestBed,
} from './panel-fixtures'
import { backOn, lockedAndProvedDead } from './panel-isolation'

const INSTRUCTOR = DEMO_ACCOUNTS.find((a) => a.role === 'instructor' && a.cohort === APPRENTICE.cohort)!
const SHOTS = 'test-results/live-shots'
const SIZES = [
  [1366, 768],
  [768, 1024],
  [390, 844],
] as const
const HINT = 'Something changed on your bench: measure before you replace anything.'

async function shootAtSizes(page: Page, name: string) {
  const before = page.viewportSize()
  for (const [width, height] of SIZES) {
    await page.setViewportSize({ width, height })
    // The app bar is fixed: a page left scrolled would draw it over the middle of a full-page shot.
    await page.evaluate(() => window.scrollTo(0, 0))
    await page.waitForTimeout(600)
    // Screenshots are for people looking at the screens; CI only checks the edges (saves a few seconds).
    if (!process.env.CI)
      await page.screenshot({ path: `${SHOTS}/${name}-${width}x${height}.png`, fullPage: true })
    expect(await overTheEdge(page), `${name} at ${width}×${height}`).toEqual([])
  }
  if (before) await page.setViewportSize(before)
}

/** What reaches past the window's right edge (a page that scrolls sideways), as tag.class: right edge. */
async function overTheEdge(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const width = document.documentElement.clientWidth
    if (document.documentElement.scrollWidth <= width) return []
    const over = [...document.querySelectorAll('body *')].filter(
      (e) => e.getBoundingClientRect().right > width,
    )
    return over
      .filter((e) => !over.some((o) => o !== e && e.contains(o)))
      .map(
        (e) =>
          `${e.tagName.toLowerCase()}.${String(e.className)}: ${Math.round(e.getBoundingClientRect().right)}`,
      )
  })
}

/** Serious or critical WCAG 2.1 A/AA findings on the page (the canvas is tested elsewhere), as rule: selector. */
async function accessibilityProblems(page: Page): Promise<string[]> {
  const result = await new AxeBuilder({ page })
    .withTags(['wcag2a', 'wcag2aa', 'wcag21a', 'wcag21aa'])
    .exclude('canvas')
    .analyze()
  return result.violations
    .filter((v) => v.impact === 'serious' || v.impact === 'critical')
    .map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)
}

async function signIn(page: Page, url: string, who: { email: string; password: string }) {
  await page.goto(url)
  await page
    .getByLabel(/e-mail/i)
    .first()
    .fill(who.email)
  await page
    .getByLabel(/password/i)
    .first()
    .fill(who.password)
  await page.getByRole('button', { name: /sign in/i }).click()
  await page.waitForURL((u) => !u.pathname.includes('sign-in'))
}

async function cohortIdOf(url: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: INSTRUCTOR.email, password: INSTRUCTOR.password }),
  })
  const { accessToken } = (await res.json()) as { accessToken: string }
  const list = (await (
    await fetch(`${url}/api/cohorts`, { headers: { authorization: `Bearer ${accessToken}` } })
  ).json()) as { items: { id: string; name: string }[] }
  const name = DEMO_COHORTS[APPRENTICE.cohort!]!.name
  const cohort = list.items.find((c) => c.name === name)
  if (!cohort) throw new Error(`${INSTRUCTOR.name} has no cohort named ${name}`)
  return cohort.id
}

describe('the live classroom, apprentice and instructor at once', () => {
  let app: RunningApp
  let apprentice: BrowserSession
  let instructor: BrowserSession
  beforeAll(async () => {
    mkdirSync(SHOTS, { recursive: true })
    app = await startApp()
    apprentice = await launchBrowser({ width: 1366, height: 768 })
    instructor = await launchBrowser({ width: 1366, height: 768 })
  })
  afterAll(async () => {
    await apprentice?.close()
    await instructor?.close()
    await app?.stop()
  })

  it('the instructor puts in a broken wire and a hint; the apprentice finds it, repairs it under lockout and is graded on it', async () => {
    const bed: PanelTestBed = { app, browser: apprentice }
    const { page: a, panel, pageErrors } = await openPanel(bed, 'raise-lower-commissioning')
    await panel.wire('drive.p24', 'runSwitch.a', 'taps')
    await panel.wire('runSwitch.b', 'drive.di1', 'taps')
    // The input's common to 0 V: without it the run circuit has no return, and no measurement tells.
    await panel.wire('drive.dcom', 'drive.0v', 'taps')

    const cohortId = await cohortIdOf(app.url)
    const i = instructor.page
    await signIn(i, app.url, INSTRUCTOR)
    await i.goto(`${app.url}/teach/cohorts/${cohortId}/live`)
    const row = i.getByTestId('live-row').filter({ hasText: APPRENTICE.name })
    await row.waitFor({ timeout: 20_000 })
    await expect.poll(() => i.getByTestId('live-stream').textContent()).toContain('Live: updates arrive')
    await expect.poll(() => row.textContent(), { timeout: 20_000 }).toContain('Working')
    await shootAtSizes(i, 'class-view')
    expect(await accessibilityProblems(i)).toEqual([])

    // Watch: the wires are in the timeline the watcher sees.
    await row
      .getByRole('link', { name: new RegExp(`Watch ${APPRENTICE.name}|Watch`) })
      .first()
      .click()
    await i.getByTestId('watch-inject').waitFor({ timeout: 30_000 })
    await a.getByTestId('live-watching').waitFor({ timeout: 20_000 })
    expect(await a.getByTestId('live-watching').textContent()).toContain(`${INSTRUCTOR.name} is watching`)

    // A broken conductor: the first wire the catalogue offers.
    await i.getByTestId('watch-inject').click()
    const option = i
      .getByTestId('inject-option')
      .filter({ hasText: /^Break wire W\d+ .*DI1/ })
      .first()
    const label = ((await option.textContent()) ?? '').trim()
    const broken = /^Break wire (W\d+)/.exec(label)![1]!
    await option.click()
    await i.getByTestId('inject-next').click()
    expect(await i.getByTestId('inject-confirm-text').textContent()).toContain(APPRENTICE.name)
    await i.getByTestId('inject-confirm').click()
    await i.getByTestId('inject-dialog').waitFor({ state: 'hidden' })

    await i.getByTestId('watch-message').click()
    await i.getByTestId('live-message-text').locator('textarea').fill(HINT)
    await i.getByTestId('live-message-send').click()
    await i.getByTestId('live-message-dialog').waitFor({ state: 'hidden' })

    // The apprentice: the hint over the panel, the indicator in the bar.
    const message = a.getByTestId('instructor-message').filter({ hasText: HINT })
    await message.waitFor({ timeout: 20_000 })
    expect(await message.textContent()).toContain(`Hint from ${INSTRUCTOR.name}`)
    // Never told what changed: the fault's words are nowhere on the apprentice's page.
    expect(await a.locator('body').textContent()).not.toContain(label)
    await shootAtSizes(a, 'apprentice-panel')
    expect(await accessibilityProblems(a)).toEqual([])
    // The task sheet lists what the fault brought, from the live grader, in words that do not name it.
    await panel.openSheet('Task')
    await expect
      .poll(() => a.getByTestId('objectives').textContent(), { timeout: 20_000 })
      .toContain('The fault your instructor put in: found by measurement')
    // The window with the list's end scrolled into view, in the sheet and on the page, at each size.
    for (const [width, height] of SIZES) {
      await a.setViewportSize({ width, height })
      await a.waitForTimeout(400)
      await a
        .getByTestId('objectives')
        .locator('li')
        .last()
        .evaluate((li) => li.scrollIntoView({ block: 'center' }))
      await a.screenshot({ path: `${SHOTS}/apprentice-task-${width}x${height}.png` })
      expect(await overTheEdge(a), `the task sheet at ${width}×${height}`).toEqual([])
    }

    // The injection went into the apprentice's log and back to the watcher: the timeline names it.
    await i.getByTestId('toggle-sheet').click()
    await i.getByRole('tab', { name: 'Timeline', exact: true }).click()
    await expect
      .poll(() => i.locator('#workspace-sheet').textContent(), { timeout: 20_000 })
      .toMatch(new RegExp(`${INSTRUCTOR.name} put in a fault: broke wire W\\d`))
    await shootAtSizes(i, 'watch-view')
    expect(await accessibilityProblems(i)).toEqual([])

    // The apprentice finds it by measurement: live, run made, the meter across the wire's two ends reads
    // the supply where a sound conductor reads about 0 V (common practice); then a diagnosis naming it.
    // A wide window, as the method test uses: the sheet stays beside the panel, clear of the proving unit.
    await a.setViewportSize({ width: 1600, height: 1000 })
    await message.getByRole('button', { name: 'Close the message' }).click()
    await panel.askSupervisorToUnlock()
    await panel.switchDisconnect('on')
    await panel.waitFor((s) => s.includes('drive ready'))
    await panel.setSelector('runSwitch', 1)
    await panel.openSheet('Values')
    await panel.meterMode('dcVolts')
    await panel.probe('red', 'runSwitch.b')
    await panel.probe('black', 'drive.di1')
    await expect.poll(() => a.getByTestId('live-meter').textContent()).toMatch(/2\d\.\d+ V/)
    await diagnose(a, `Wire ${broken}`, 'Open circuit')
    await panel.setSelector('runSwitch', 0)

    // Repaired under lockout: off, own lock, proved dead live–dead–live, the wire run again, back on.
    await lockedAndProvedDead(a, panel)
    await panel.openSheet('Wiring')
    await a.getByRole('button', { name: new RegExp(`^Remove wire ${broken} `) }).click()
    await panel.openSheet('Values')
    await panel.wire('runSwitch.b', 'drive.di1')
    await backOn(panel)

    // The submission: the server takes the log with the instructor's fault and hint in it (it refuses one
    // that lacks an injection it holds), grades it, and the watcher sees the attempt end.
    const attemptId = new URL(i.url()).pathname.split('/').pop()!
    const grade = await submitForGrade(a, 'live-classroom-submitted')
    expect(grade).toMatch(/\d+ \/ 100/)
    await expect
      .poll(() => i.getByTestId('watch-state').textContent(), { timeout: 20_000 })
      .toContain('has ended')
    expect(pageErrors).toEqual([])

    // The grade holds the injected fault's objectives, every one met.
    const token = await apiToken(app.url)
    const attempt = (await (
      await fetch(`${app.url}/api/attempts/${attemptId}`, { headers: { authorization: `Bearer ${token}` } })
    ).json()) as { grade: { evidence: { objectives: ObjectiveResult[] } } }
    const injected = attempt.grade.evidence.objectives.filter((o) => o.injection)
    expect(injected.map((o) => [o.title, o.met])).toEqual([
      ['The fault your instructor put in: put right, working safely', true],
      ['The fault your instructor put in: diagnosed correctly', true],
      ['The fault your instructor put in: found by measurement', true],
    ])

    // The instructor's review opens the replay, whose timeline names the injection.
    await i.goto(`${app.url}/teach/attempts/${attemptId}`)
    await expect
      .poll(() => i.locator('main').textContent(), { timeout: 20_000 })
      .toContain('The fault your instructor put in: found by measurement')
    await i.getByRole('link', { name: 'Open the replay' }).click()
    await i.getByTestId('replay-slider').waitFor({ timeout: 30_000 })
    const sheet = i.getByTestId('toggle-sheet')
    if ((await sheet.getAttribute('aria-expanded')) !== 'true') await sheet.click()
    await i.getByRole('tab', { name: 'Timeline', exact: true }).click()
    await expect
      .poll(() => i.locator('#workspace-sheet').textContent(), { timeout: 20_000 })
      .toContain(`${INSTRUCTOR.name} put in a fault: broke wire ${broken}`)
  }, 180_000)
})
