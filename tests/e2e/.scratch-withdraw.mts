// Scratch (not committed): screenshots of withdrawing a sign-off, and the training record PDF after it.
import { writeFileSync } from 'node:fs'
import { DEMO_ACCOUNTS } from '../../server/demo/demo-accounts'
import { launchBrowser, startApp } from './support'

const out = '/tmp/schemtab-shots'
const instructor = DEMO_ACCOUNTS.find((a) => a.role === 'instructor')!
const app = await startApp()
try {
  const api = async (path: string, init: RequestInit = {}, token?: string) => {
    const res = await fetch(`${app.url}/api${path}`, {
      ...init,
      headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) },
    })
    if (!res.ok) throw new Error(`${path}: ${res.status} ${await res.text()}`)
    return res
  }
  const { accessToken } = (await (
    await api('/auth/sign-in', { method: 'POST', body: JSON.stringify({ email: instructor.email, password: instructor.password }) })
  ).json()) as { accessToken: string }
  const cohorts = (await (await api('/cohorts', {}, accessToken)).json()) as { items?: { id: string }[] } | { id: string }[]
  const list = Array.isArray(cohorts) ? cohorts : cohorts.items!
  const cohortId = list[0]!.id
  const members = (await (await api(`/cohorts/${cohortId}/members`, {}, accessToken)).json()) as unknown
  const memberList = (Array.isArray(members) ? members : (members as { items: unknown[] }).items) as { userId: string; name: string }[]
  const who = memberList[0]!
  const record = (await (await api(`/apprentices/${who.userId}/training-record?cohortId=${cohortId}`, {}, accessToken)).json()) as {
    outcomes: { scenarioKey: string; outcome: string; signOff: unknown }[]
  }
  const o = record.outcomes.find((x) => !x.signOff)!
  await api(`/apprentices/${who.userId}/sign-offs`, { method: 'POST', body: JSON.stringify({ cohortId, scenarioKey: o.scenarioKey, outcome: o.outcome, note: 'Proved dead at the drive terminals before touching them.' }) }, accessToken)

  for (const [width, height] of [[1366, 768], [390, 844]] as const) {
    const browser = await launchBrowser({ width, height })
    const page = browser.page
    await page.goto(app.url)
    await page.getByLabel(/e-mail/i).first().fill(instructor.email)
    await page.getByLabel(/password/i).first().fill(instructor.password)
    await page.getByRole('button', { name: /sign in/i }).click()
    await page.waitForURL((u) => !u.pathname.includes('sign-in'))
    await page.goto(`${app.url}/cohorts/${cohortId}`)
    await page.getByRole('button', { name: `Training record of ${who.name}` }).click()
    await page.getByRole('button', { name: /^Withdraw the sign-off/ }).first().waitFor()
    await page.screenshot({ path: `${out}/withdraw-0-record-${width}.png` })
    if (width === 1366) {
      await page.getByRole('button', { name: /^Withdraw the sign-off/ }).first().click()
      await page.getByLabel('Reason: why the sign-off is withdrawn').fill('Signed off before the attempt was reviewed.')
      await page.getByRole('button', { name: 'Continue' }).click()
      await page.getByTestId('confirm-written-action').waitFor()
      await page.screenshot({ path: `${out}/withdraw-1-confirm-${width}.png` })
      await page.getByTestId('confirm-written-action').click()
      await page.getByTestId('withdrawn-sign-off').first().waitFor()
      await page.waitForTimeout(500)
      await page.screenshot({ path: `${out}/withdraw-2-after-${width}.png` })
      const pdf = await api(`/apprentices/${who.userId}/training-record.pdf?cohortId=${cohortId}`, {}, accessToken)
      writeFileSync(`${out}/training-record-after-withdrawal.pdf`, Buffer.from(await pdf.arrayBuffer()))
    }
    await browser.close()
  }
} finally {
  await app.stop()
}
