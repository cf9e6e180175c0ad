// An instructor builds a new troubleshooting exercise without seeing its file format (#17): the story
// and a device in the form, the starting wiring on the panel itself, a fault, objectives and a hint in the
// form; records a reference solution on the panel; publishes it and assigns it to their cohort. An
// apprentice, in a browser of their own, opens the assignment, repairs the fault under lockout and is
// graded by the server. Screenshots of each editor step go to test-results/screenshots/ (not in CI).
import { mkdirSync } from 'node:fs'
import { join } from 'node:path'
import type { Locator, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { AttemptSummary } from '../../shared/api/attempts'
import type { Scenario } from '../../shared/scenario/schema'
import type { PanelDevice, PointId } from '../../src/simulator/scene/types'
import { demo, signIn } from './client-steps'
import { PanelDriver } from './panel-driver'
import { diagnose, submitForGrade } from './panel-fixtures'
import { launchBrowser, startApp, SCREENSHOT_DIR, type BrowserSession, type RunningApp } from './support'
import { networkQuiet } from './support/browser'

const INSTRUCTOR = demo('instructor')
const APPRENTICE = demo('apprentice')
const KEY = 'kiln-fan-run-switch'
const TITLE = 'The kiln fan ignores its run switch'
const RUN_SWITCH: PanelDevice = {
  id: 'runSwitch',
  kind: 'selector',
  label: 'Run switch',
  contact: 'NO',
}
const STORY =
  'The circulation fan of kiln 2 at Harrowmere Timber Kilns will not start from its run switch since a ' +
  'forklift caught the cable tray. Bryony Castellane has isolated the kiln and put your lock on it. Find ' +
  'the fault, record your diagnosis, and repair it under lockout.'
const OUTCOME = 'Find a broken conductor in a run circuit and repair it under lockout'
const SAFETY_NOTE =
  'Work on the terminals only under your own lock, after proving absence of voltage; local codes and the ' +
  "equipment's instructions come first."
const HINT = 'With the switch made, measure across each conductor of the run circuit in turn.'
/** Names in the scenario format that must never reach the author's screen. */
const FILE_FORMAT_NAMES = [
  /\brunSwitch\b/,
  /\b(drive|runSwitch)\.[a-z0-9]+\b/,
  /\b(hint|objective)-\d+\b/,
  /\b(brokenWire|faultFoundAndCleared|diagnosisCorrect|lockBeforeWiring|wireId|passMark)\b/,
]

/** The run wire's removal button in the Wiring tab (its marker and colour come from the panel). */
const REMOVE_RUN_WIRE = /^Remove wire \S+ \S+ from Run switch 14 to DI1/

/**
 * Picks an option from a select field by its words. The list is opened from the keyboard: a click can land
 * on the form's sticky save bar or the app bar, which lie over a field scrolled to the window's edge.
 */
async function choose(page: Page, field: Locator, option: string | RegExp) {
  await field.focus()
  await page.keyboard.press('Enter')
  await page.getByRole('option', { name: option, exact: typeof option === 'string' }).click()
}

/** Adds an objective from the catalogue and fills in its fields (the newest is open below the others). */
async function addObjective(
  page: Page,
  kind: string,
  title: string,
  points: number,
  with_: { fault?: boolean; hint?: boolean; required?: boolean },
) {
  // A search field: the kind typed, then picked from what is left.
  await page.getByRole('combobox', { name: 'Add an objective' }).fill(kind)
  await page.getByRole('option', { name: kind, exact: true }).click()
  const item = page.getByTestId('objective-item').last()
  await item.getByLabel('Title the apprentice sees').fill(title)
  await item.getByLabel('Points', { exact: true }).fill(String(points))
  if (with_.fault)
    await choose(page, item.getByRole('combobox', { name: 'Fault', exact: true }), /^Fault 1: /)
  if (with_.hint) {
    await choose(page, item.getByRole('combobox', { name: 'Hints offered beside it' }), HINT.slice(0, 60))
    await page.keyboard.press('Escape') // a list of several choices stays open
  }
  if (with_.required) await item.getByLabel('Must be met to pass, whatever the score').check()
}

/**
 * What the author sees (the page's text and the text typed into its fields, not the values a select keeps
 * out of sight) holds no file format: no braces, no JSON paths, no internal names or ids.
 */
async function noFileFormat(page: Page, ids: readonly string[] = []) {
  const shown = await page.evaluate(() =>
    [
      document.body.innerText,
      ...[...document.querySelectorAll<HTMLInputElement | HTMLTextAreaElement>('input, textarea')]
        .filter((e) => e.type !== 'hidden' && !e.closest('.v-select, .v-autocomplete'))
        .map((e) => e.value),
    ].join('\n'),
  )
  expect(shown).not.toContain('{')
  expect(shown).not.toContain('$.')
  const names = [...FILE_FORMAT_NAMES, ...ids.map((id) => new RegExp(`\\b${id}\\b`))]
  expect(names.filter((name) => name.test(shown)).map(String)).toEqual([])
}

/**
 * A screenshot of what the window shows with a part of the page scrolled into it (the editor's save bar
 * and checker stay in place, so a full-page shot would draw them across the form). For people looking at
 * the screens: CI skips them.
 */
async function shot(page: Page, name: string, part?: Locator) {
  if (process.env.CI) return
  // Just below the app bar, which is fixed over the top of the window.
  if (part)
    await part.evaluate((e) => window.scrollTo(0, e.getBoundingClientRect().top + window.scrollY - 72))
  else await page.evaluate(() => window.scrollTo(0, 0))
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  await page.screenshot({ path: join(SCREENSHOT_DIR, `authoring-${name}.png`) })
}

/**
 * The panel driver for a draft on the panel and for an attempt alike: a wire drawn is checked by the
 * count of wires in the canvas's summary (a draft's run keeps no log in the browser to read it from).
 */
class CountingPanelDriver extends PanelDriver {
  private async wireCount(): Promise<string> {
    return `${/(\d+) wires/.exec(await this.summary())?.[1] ?? 'no count of'} wires`
  }

  override async wire(from: PointId, to: PointId) {
    const before = Number(/\d+/.exec(await this.wireCount())?.[0])
    await this.until(
      { action: `wiring ${from} to ${to}`, expected: `${before + 1} wires`, observe: () => this.wireCount() },
      () => this.drag(this.terminal(from), this.terminal(to)),
    )
  }

  /** Takes the run wire off from the Wiring tab and draws it again between the same terminals. */
  async remakeRunWire() {
    await this.openSheet('Wiring')
    const before = await this.wireCount()
    await this.page.getByRole('button', { name: REMOVE_RUN_WIRE }).click()
    await expect.poll(() => this.wireCount()).not.toBe(before)
    await this.closeSheet()
    await this.wire('runSwitch.b', 'drive.di1')
  }
}

/**
 * Waits for a panel page (a draft's or an attempt's) to start. The first-run safety notice and the tour
 * show once per browser: the caller says which to expect, so that nothing waits for what will not come.
 */
async function panelOn(page: Page, shows: { notice: boolean; tour: boolean }): Promise<CountingPanelDriver> {
  if (shows.notice) await acknowledge(page.getByTestId('safety-understood'))
  const panel = new CountingPanelDriver(page, [RUN_SWITCH])
  await panel.ready()
  if (shows.tour) await acknowledge(page.getByTestId('tour-skip'))
  return panel
}

async function acknowledge(button: Locator) {
  await button.click({ timeout: 30_000 })
  await button.waitFor({ state: 'hidden', timeout: 15_000 })
}

/** The repair as a fault-finder makes it, already isolated and locked: diagnose, prove dead, re-run the wire. */
async function repairRunWire(page: Page, panel: CountingPanelDriver) {
  await diagnose(page, 'Wire W2', 'Open circuit')
  await panel.proveDead()
  await panel.remakeRunWire()
}

async function apiToken(url: string, who: { email: string; password: string }): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: who.email, password: who.password }),
  })
  if (!res.ok) throw new Error(`sign-in failed: ${res.status} ${await res.text()}`)
  return ((await res.json()) as { accessToken: string }).accessToken
}

async function api<T>(url: string, token: string, path: string, init: RequestInit = {}): Promise<T> {
  const res = await fetch(`${url}/api${path}`, {
    ...init,
    headers: { authorization: `Bearer ${token}`, 'content-type': 'application/json' },
  })
  if (!res.ok) throw new Error(`${init.method ?? 'GET'} ${path}: ${res.status} ${await res.text()}`)
  return (await res.json()) as T
}

describe('authoring a troubleshooting exercise without JSON, then assigning and grading it', () => {
  let app: RunningApp
  let instructor: BrowserSession
  let apprentice: BrowserSession
  let instructorToken: string
  beforeAll(async () => {
    app = await startApp()
    instructor = await launchBrowser({ width: 1600, height: 1000 })
    instructorToken = await apiToken(app.url, INSTRUCTOR)
  })
  afterAll(async () => {
    await apprentice?.close()
    await instructor?.close()
    await app?.stop()
  })

  /** Every id in the saved draft: the author must never see one. */
  async function draftIds(): Promise<string[]> {
    const { document: d } = await api<{ document: Scenario }>(
      app.url,
      instructorToken,
      `/scenarios/${KEY}/draft`,
    )
    return [
      ...d.start.devices.map((x) => x.id),
      ...(d.start.wires ?? []).map((x) => x.id),
      ...d.hints.map((x) => x.id),
      ...d.objectives.map((x) => x.id),
    ]
  }

  it('builds the story and a device in the form', async () => {
    const { page } = instructor
    await signIn(page, app.url, INSTRUCTOR)
    await page.goto(`${app.url}/scenarios/new`)
    await page.getByTestId('story-title').getByRole('textbox').fill(TITLE)
    await page.getByLabel('Name in links').fill(KEY)
    await page.getByLabel('Site (invented)').fill('Harrowmere Timber Kilns')
    await page.getByLabel('Machine', { exact: true }).fill('Kiln 2 circulation fan')
    await page.getByLabel('People in the story').fill('Bryony Castellane, kiln supervisor\nyou, apprentice')
    await page.getByLabel('Story', { exact: true }).fill(STORY)
    await page.getByLabel('Learning outcomes').fill(OUTCOME)
    await page.getByLabel('Safety notes').fill(SAFETY_NOTE)
    await choose(page, page.getByRole('combobox', { name: 'Difficulty' }), 'Intermediate')
    await page.getByLabel('Estimated time').fill('15')

    await choose(page, page.getByRole('combobox', { name: 'Kind of device' }), 'Selector switch')
    await page.getByTestId('add-device').click()
    const device = page.getByTestId('device-item')
    await device.getByLabel('Label on the panel').fill(RUN_SWITCH.label)
    await expect.poll(() => device.textContent()).toContain('Normally open')
    await shot(page, '1a-story')
    await shot(page, '1b-device', page.getByTestId('section-devices'))
    await noFileFormat(page)

    await page.getByTestId('save-draft').click()
    await page.waitForURL((u) => u.pathname === `/scenarios/${KEY}/edit`)
    await page.getByTestId('saved').waitFor()
  }, 60_000)

  it('sets up the starting wiring on the panel, off and locked', async () => {
    const { page } = instructor
    await page.getByTestId('set-up-on-panel').click()
    await page.waitForURL((u) => u.pathname === `/scenarios/${KEY}/draft/set-up`)
    const panel = await panelOn(page, { notice: true, tour: false })
    // As the shipped dead-control-circuit scenario wires its run selector (sink logic on DI1).
    await panel.wire('drive.p24', 'runSwitch.a')
    await panel.wire('runSwitch.b', 'drive.di1')
    await panel.wire('drive.dcom', 'drive.0v')
    await panel.applyLock()
    await expect
      .poll(() => page.getByTestId('setup-power').textContent())
      .toMatch(/disconnect OFF, with their own lock on it/)
    await page.getByTestId('setup-save').click()

    // Back in the editor: the wiring in words, the power off and the apprentice's lock on.
    await page.waitForURL((u) => u.pathname === `/scenarios/${KEY}/edit`)
    const wires = page.getByTestId('start-wires').locator('li')
    await expect.poll(() => wires.allTextContents()).toHaveLength(3)
    expect((await wires.allTextContents()).join('\n')).toMatch(/Run switch terminal 14 to DI1/)
    await expect(page.getByLabel('Power on at the start').isChecked()).resolves.toBe(false)
    await expect(page.getByLabel("The apprentice's own lock is already on").isChecked()).resolves.toBe(true)
    await shot(page, '2-start-set-on-the-panel', page.getByTestId('section-start'))
    await noFileFormat(page, await draftIds())
  }, 90_000)

  it('adds a fault, objectives and a hint in the form, with no JSON on screen', async () => {
    const { page } = instructor
    await choose(
      page,
      page.getByRole('combobox', { name: 'Add a fault' }),
      'A wire broken inside its insulation',
    )
    const fault = page.getByTestId('fault-item')
    await choose(page, fault.getByRole('combobox', { name: 'Which wire' }), /Run switch terminal 14 to DI1/)

    await page.getByTestId('add-hint').click()
    const hint = page.getByTestId('hint-item')
    await hint.getByLabel('What the hint says').fill(HINT)
    await hint.getByLabel('Costs').fill('5')

    await addObjective(page, 'Fault found and put right', 'The run circuit working again', 40, {
      fault: true,
      hint: true,
    })
    await addObjective(page, 'Diagnosis correct', 'The fault diagnosed before its repair', 30, {
      fault: true,
    })
    await addObjective(page, 'Locked off before work', 'Locked off before touching a terminal', 30, {
      required: true,
    })
    await page.getByLabel('Pass mark').fill('70')
    await expect
      .poll(() => page.getByTestId('pass-mark-summary').textContent())
      .toMatch(/Pass mark 70 of 100 points/)

    await page.getByTestId('save-draft').click()
    await page.getByTestId('saved').waitFor()
    await expect.poll(() => page.getByTestId('scenario-checker').textContent()).toMatch(/No problems found/)
    await shot(page, '3a-fault-and-hint', page.getByTestId('section-faults'))
    await shot(page, '3b-objectives', page.getByTestId('section-objectives'))
    await shot(page, '3c-required-objective', page.getByTestId('objective-item').last())
    await noFileFormat(page, await draftIds())
    // The draft holds what the form chose, by the ids the author never saw.
    const { document } = await api<{ document: Scenario }>(
      app.url,
      instructorToken,
      `/scenarios/${KEY}/draft`,
    )
    const runWire = document.start.wires!.find((w) => w.from === 'runSwitch.b' && w.to === 'drive.di1')
    expect(document.faults).toEqual([{ kind: 'brokenWire', wireId: runWire?.id }])
    expect(document.objectives.map((o) => [o.kind, o.weight, o.required ?? false])).toEqual([
      ['faultFoundAndCleared', 40, false],
      ['diagnosisCorrect', 30, false],
      ['lockBeforeWiring', 30, true],
    ])
    expect(document.objectives[0]!.hints).toEqual([document.hints[0]!.id])
  }, 60_000)

  it('records a reference solution that earns full marks', async () => {
    const { page } = instructor
    await page.goto(`${app.url}/scenarios/${KEY}/draft/reference`)
    const panel = await panelOn(page, { notice: false, tour: true })
    await repairRunWire(page, panel)
    await page.getByTestId('reference-save').click()
    const result = page.getByTestId('reference-result')
    await result.waitFor({ timeout: 30_000 })
    expect(await result.textContent()).toMatch(/Full marks: 100 of 100 points/)
    await shot(page, '4-reference-full-marks')
  }, 120_000)

  it('publishes version 1 and assigns it to the cohort', async () => {
    const { page } = instructor
    await page.goto(`${app.url}/scenarios/${KEY}`)
    await networkQuiet(page)
    await page.getByTestId('draft-publish').click()
    await page.getByText('Version 1 · the current version').waitFor()
    await page.getByRole('button', { name: 'Assign', exact: true }).click()
    // The demo instructor teaches one cohort: it is chosen already.
    await page.getByRole('dialog').getByRole('button', { name: 'Continue' }).click()
    await page.waitForURL((u) => /\/teach\/cohorts\/[^/]+\/assign/.test(u.pathname))
    await expect.poll(() => page.getByTestId('assign-scenario').textContent()).toContain(`${TITLE} (v1)`)
    await page.getByRole('button', { name: 'Assign', exact: true }).click()
    await page.waitForURL((u) => /^\/teach\/cohorts\/[^/]+$/.test(u.pathname))
  }, 60_000)

  it('an apprentice opens the assignment, repairs the fault and is graded', async () => {
    apprentice = await launchBrowser({ width: 1600, height: 1000 })
    const { page } = apprentice
    await signIn(page, app.url, APPRENTICE)
    await page.waitForURL((u) => u.pathname === '/learn')
    const card = page.locator('.v-card', { hasText: TITLE })
    await card.getByRole('link', { name: 'Start' }).click()
    const panel = await panelOn(page, { notice: true, tour: true })
    await repairRunWire(page, panel)
    const grade = await submitForGrade(page, 'authoring-6-apprentice-graded')
    expect(grade).toMatch(/Graded: 100 \/ 100 — passed/)

    // The server's record of the attempt says the same.
    const token = await apiToken(app.url, APPRENTICE)
    const { items } = await api<{ items: AttemptSummary[] }>(app.url, token, '/attempts')
    const mine = items.find((a) => a.scenarioKey === KEY)
    expect(mine?.scenarioVersion).toBe(1)
    expect(mine?.assignmentId).not.toBeNull()
    expect(mine?.grade).toMatchObject({ score: 100, passed: true })
    expect(mine?.grade?.evidence?.objectives.every((o) => o.met)).toBe(true)
  }, 120_000)
})
