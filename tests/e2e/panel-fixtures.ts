// Shared set-up for the panel's browser tests: sign in, find a scenario version, and a ready-made
// event log of the raise/lower commissioning (what an apprentice's correct attempt records).
import type { Page } from 'playwright-core'
import type { AttemptEvent } from '../../shared/model/events'
import { DEMO_ACCOUNTS } from '../../server/services/demo-accounts'

export const APPRENTICE = DEMO_ACCOUNTS.find((a) => a.role === 'apprentice')!

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

/** Acknowledges the first-run safety notice if it is shown. */
export async function dismissSafetyNotice(page: Page) {
  await page
    .getByTestId('safety-understood')
    .click({ timeout: 15_000 })
    .catch(() => undefined)
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

/** Isolated, proved dead, wired for sink logic, programmed, started and raised; the motor runs at the end. */
export function raiseLowerRunningLog(): AttemptEvent[] {
  return [
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
