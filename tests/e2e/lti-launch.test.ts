// Slipway inside a learning platform's page (the fake platform of tests/support, on another site: 127.0.0.1
// against Slipway's localhost, so Slipway's frame is truly third-party). An admin registers the platform; an
// instructor adds an activity through deep linking in the frame; an apprentice launches it into the
// simulator, submits, and the platform receives the same score Slipway shows; an override follows.
// The exercise is not driven click by click (panel-commissioning.test.ts does that): the reference log of
// the raise/lower commissioning goes through the page's own save path (the attempt kept in the browser,
// resumed on reload), then the page's Submit button sends it.
import { readFileSync } from 'node:fs'
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Frame, FrameLocator, Page } from 'playwright-core'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { startSlipway, freePort, type ServerProcess } from '../support/server-process'
import { FakeLtiPlatform, ROLE } from '../support/fake-lti-platform'
import { launchBrowser, screenshot, type BrowserSession } from './support'
import { raiseLowerCompleteLog } from './panel-fixtures'

const ADMIN = DEMO_ACCOUNTS.find((a) => a.role === 'admin')!
const SCENARIO_TITLE = JSON.parse(readFileSync(resolve('scenarios/raise-lower-commissioning.json'), 'utf8'))
  .title as string
const SIZES = [
  { name: 'desktop', width: 1366, height: 768 },
  { name: 'tablet', width: 768, height: 1024 },
  { name: 'phone', width: 390, height: 844 },
]

async function api(base: string, path: string, init: RequestInit & { token?: string } = {}) {
  const response = await fetch(`${base}${path}`, {
    ...init,
    headers: {
      'content-type': 'application/json',
      ...(init.token ? { authorization: `Bearer ${init.token}` } : {}),
    },
  })
  const body = await response.json().catch(() => undefined)
  if (!response.ok)
    throw new Error(`${init.method ?? 'GET'} ${path}: ${response.status} ${JSON.stringify(body)}`)
  return body
}

/** The Slipway frame of the platform's course page, once it shows a page whose address matches. */
async function toolFrame(page: Page, path: RegExp): Promise<Frame> {
  const deadline = Date.now() + 60_000
  for (;;) {
    const frame = page.frames().find((f) => f !== page.mainFrame() && path.test(new URL(f.url()).pathname))
    if (frame) return frame
    if (Date.now() > deadline) {
      await screenshot(page, `lti-failed-${path.source.replace(/\W+/g, '-')}`)
      throw new Error(
        `no frame at ${path}; frames: ${page
          .frames()
          .map((f) => f.url())
          .join(', ')}`,
      )
    }
    await page.waitForTimeout(200)
  }
}

describe('Slipway launched from a learning platform', () => {
  let slipway: ServerProcess
  let dataDir: string
  let platform: FakeLtiPlatform
  let browser: BrowserSession
  let toolUrl: string
  let adminToken: string

  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'slipway-e2e-lti-'))
    const port = await freePort()
    // Slipway answers at localhost, the platform at 127.0.0.1: two sites, so the frame is third-party.
    toolUrl = `http://localhost:${port}`
    slipway = await startSlipway(dataDir, { port, env: { PUBLIC_BASE_URL: toolUrl } })
    const local = `http://127.0.0.1:${port}`
    platform = new FakeLtiPlatform({
      toolUrl,
      toolKeySet: async () => (await fetch(`${local}/api/lti/jwks`)).json(),
    })
    await platform.start()
    platform.addPerson({
      sub: 'inst-7',
      name: 'Tamsin Rook',
      email: 'tamsin.rook@harbour.example',
      roles: [ROLE.instructor],
    })
    platform.addPerson({
      sub: 'learner-7',
      name: 'Pell Ardent',
      email: 'pell.ardent@harbour.example',
      roles: [ROLE.learner],
    })
    adminToken = (
      await api(local, '/api/auth/sign-in', {
        method: 'POST',
        body: JSON.stringify({ email: ADMIN.email, password: ADMIN.password }),
      })
    ).accessToken
    browser = await launchBrowser({ width: 1366, height: 768 })
  })
  afterAll(async () => {
    await browser?.close()
    await platform?.stop()
    await slipway?.stop()
    if (dataDir) rmSync(dataDir, { recursive: true, force: true })
  })

  it('registers the platform on the admin page', async () => {
    const { page } = browser
    await page.goto(toolUrl)
    await page
      .getByLabel(/e-mail/i)
      .first()
      .fill(ADMIN.email)
    await page
      .getByLabel(/password/i)
      .first()
      .fill(ADMIN.password)
    await page.getByRole('button', { name: /sign in/i }).click()
    await page.waitForURL((u) => !u.pathname.includes('sign-in'))
    await page.goto(`${toolUrl}/admin/learning-platforms`)
    await page.getByTestId('lti-tool-values').getByText(`${toolUrl}/api/lti/login`).waitFor()
    await page.getByTestId('platform-add').click()
    const dialog = page.getByRole('dialog')
    const reg = platform.registration
    await dialog.getByLabel('Name shown in Slipway').fill(reg.name)
    await dialog.getByLabel(/Issuer/).fill(reg.issuer)
    await dialog.getByLabel('Client id given to Slipway').fill(reg.clientId)
    await dialog.getByLabel(/Deployment ids/).fill(reg.deploymentIds.join('\n'))
    await dialog.getByLabel(/Sign-in \(authorisation\) address/).fill(reg.authorizationEndpoint)
    await dialog.getByLabel('Access token address').fill(reg.tokenEndpoint)
    await dialog.getByLabel('Public key set address').fill(reg.jwksUrl)
    await screenshot(page, 'lti-registration-dialog')
    await dialog.getByTestId('platform-save').click()
    await page.getByText(reg.name, { exact: true }).waitFor()
    for (const size of SIZES) {
      await page.setViewportSize(size)
      await screenshot(page, `lti-registration-${size.name}`)
    }
    await page.setViewportSize(SIZES[0]!)
  })

  it('lets the instructor add the exercise as a course activity (deep linking, in the frame)', async () => {
    const page = await browser.context.newPage()
    await page.goto(`${platform.url}/course?person=inst-7&deepLink=1`)
    const frame = await toolFrame(page, /^\/lti\/deep-link\//)
    const picker = frame.locator('body')
    await picker.getByTestId('deep-link-scenario').click()
    await frame.getByRole('option', { name: new RegExp(SCENARIO_TITLE) }).click()
    await screenshot(page, 'lti-deep-link-picker')
    await frame.getByTestId('deep-link-add').click()
    await expect.poll(() => platform.deepLinkAnswers.length, { timeout: 30_000 }).toBe(1)
    expect(platform.activities.get('activity-1')?.custom.slipway_assignment_id).toEqual(expect.any(String))
    await page.close()
  })

  it('opens the exercise inside the frame even when the browser refuses the frame any storage', async () => {
    // Chromium's default (third-party cookies phased out): no localStorage or sessionStorage in the frame,
    // only partitioned cookies. The launch still signs in and opens the simulator.
    const page = await browser.context.newPage()
    const pageErrors: string[] = []
    page.on('pageerror', (e) => pageErrors.push(e.message))
    await page.goto(`${platform.url}/course?person=learner-7&link=activity-1`)
    const frame = await toolFrame(page, /^\/simulator\//)
    expect(
      await frame.evaluate(() => {
        try {
          return (void localStorage.length, 'allowed')
        } catch {
          return 'refused'
        }
      }),
    ).toBe('refused')
    const inFrame = page.frameLocator('#tool')
    const understood = inFrame.getByTestId('safety-understood')
    await understood.click({ timeout: 20_000 }).catch(() => undefined)
    await inFrame.getByTestId('panel-canvas').waitFor({ timeout: 60_000 })
    for (const size of SIZES) {
      await page.setViewportSize(size)
      await page.waitForTimeout(500)
      await screenshot(page, `lti-launched-exercise-${size.name}`)
    }
    expect(pageErrors).toEqual([])
    await page.close()
  })

  it('launches the apprentice into the simulator, and the platform receives the score Slipway shows; an override follows', async () => {
    // A browser that gives the frame partitioned storage (Firefox's way; Chromium with third-party cookies
    // allowed), so the reference log can go where the page keeps an attempt in progress.
    const partitioned = await launchBrowser({
      width: 1366,
      height: 768,
      args: ['--disable-features=TrackingProtection3pcd'],
    })
    try {
      const page = partitioned.page
      const pageErrors: string[] = []
      page.on('pageerror', (e) => pageErrors.push(e.message))
      await page.goto(`${platform.url}/course?person=learner-7&link=activity-1`)
      let frame = await toolFrame(page, /^\/simulator\//)
      const assignmentId = new URL(frame.url()).searchParams.get('assignment')!
      expect(assignmentId).toBe(platform.activities.get('activity-1')!.custom.slipway_assignment_id)
      const inFrame: FrameLocator = page.frameLocator('#tool')

      // The reference log goes where the page keeps an attempt in progress; reloading the frame resumes it
      // (and signs in again through the partitioned refresh cookie: the access token lived in memory only).
      const events = raiseLowerCompleteLog()
      await frame.evaluate(
        ([key, log]) =>
          localStorage.setItem(
            key,
            JSON.stringify({
              version: 1,
              attemptId: crypto.randomUUID(),
              events: log,
              savedAt: new Date().toISOString(),
            }),
          ),
        [`slipway.attempt.assignment.${assignmentId}`, events] as const,
      )
      await frame.evaluate(() => location.reload()).catch(() => undefined) // the reload ends this context
      frame = await toolFrame(page, /^\/simulator\//)
      const understood = inFrame.getByTestId('safety-understood')
      await understood.click({ timeout: 20_000 }).catch(() => undefined)
      await inFrame
        .getByText(`Resumed the attempt saved in this browser (${events.length} actions)`)
        .waitFor({ timeout: 30_000 })
      // The workspace: its first-run tour is skipped, the task sheet may be folded away, and submitting
      // asks for confirmation first.
      await inFrame
        .getByTestId('tour-skip')
        .click({ timeout: 5_000 })
        .catch(() => undefined)
      const sheet = inFrame.getByTestId('toggle-sheet')
      if ((await sheet.getAttribute('aria-expanded')) !== 'true') await sheet.click()
      await inFrame.getByRole('tab', { name: 'Task', exact: true }).click()
      await inFrame.getByTestId('submit-attempt').click()
      await inFrame.getByTestId('confirm-submit-button').click()
      const grade = inFrame.getByTestId('attempt-grade')
      await grade.waitFor({ timeout: 30_000 })
      const shown = Number(/Graded: ([\d.]+) \/ 100/.exec((await grade.textContent()) ?? '')![1])
      await screenshot(page, 'lti-launched-exercise-graded')
      await expect.poll(() => platform.scores.length, { timeout: 30_000 }).toBe(1)
      expect(platform.scores[0]).toMatchObject({ userId: 'learner-7', scoreGiven: shown, scoreMaximum: 100 })

      const attempts = await api(
        toolUrl.replace('localhost', '127.0.0.1'),
        `/api/attempts?assignmentId=${assignmentId}`,
        { token: adminToken },
      )
      await api(
        toolUrl.replace('localhost', '127.0.0.1'),
        `/api/attempts/${attempts.items[0].id}/grade-override`,
        {
          method: 'POST',
          token: adminToken,
          body: JSON.stringify({ score: 72, passed: true, reason: 'Checked the ramp times by hand' }),
        },
      )
      await expect.poll(() => platform.scores.at(-1)?.scoreGiven, { timeout: 30_000 }).toBe(72)
      expect(pageErrors).toEqual([])
    } finally {
      await partitioned.close()
    }
  })

  it('shows the course link on the cohort page, pulls the roster, and marks the grade sent in the gradebook', async () => {
    platform.addPerson({ sub: 'learner-8', name: 'Wren Holloway', roles: [ROLE.learner] })
    const local = toolUrl.replace('localhost', '127.0.0.1')
    const assignmentId = platform.activities.get('activity-1')!.custom.slipway_assignment_id!
    const { cohortId } = await api(local, `/api/assignments/${assignmentId}`, { token: adminToken })
    const { page } = browser // the admin, signed in by the first test
    await page.goto(`${toolUrl}/teach/cohorts/${cohortId}`)
    await page.getByTestId('course-link').getByText(platform.contextTitle, { exact: false }).waitFor()
    await page.getByTestId('roster-pull').click()
    await expect(page.getByTestId('roster-result').textContent()).resolves.toMatch(
      /1 apprentice enrolled, 1 already here/,
    )
    await page.getByRole('cell', { name: 'Wren Holloway' }).first().waitFor()
    await screenshot(page, 'lti-cohort-course-link')
    await page.goto(`${toolUrl}/teach/gradebook?cohort=${cohortId}`)
    const mark = page.getByTestId('score-sync').first()
    await mark.waitFor()
    await expect(mark.getAttribute('aria-label')).resolves.toBe('Sent to the course: 72')
    await screenshot(page, 'lti-gradebook-sync')
  })
})
