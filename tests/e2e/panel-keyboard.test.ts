// The same commissioning job with the keyboard only: probes and wires chosen from lists, the
// keypad and disconnect as buttons, FASTER/SLOWER held with their letter keys, submit with Enter.
import { describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import type { KeypadKey } from '../../src/simulator/scene/types'
import { screenshot } from './support'
import { openPanel, panelTestBed } from './panel-fixtures'
import type { PanelDriver } from './panel-driver'

async function choose(page: Page, label: string, query: string) {
  // The input comes first: while its menu is open, the (teleported) listbox carries the same label.
  const input = page.getByLabel(label, { exact: true }).first()
  const wanted = new RegExp(query.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'), 'i')
  // Keyboard selection races the list's filtering on a busy machine: check what was chosen, and choose
  // again if the filter had not caught up.
  for (let attempt = 0; attempt < 3; attempt++) {
    await input.focus()
    await input.fill(query)
    await page.getByRole('option', { name: wanted }).first().waitFor({ state: 'visible' })
    await expect
      .poll(async () => page.getByRole('option').first().textContent(), { timeout: 5_000 })
      .toMatch(wanted)
    await page.keyboard.press('ArrowDown')
    await page.keyboard.press('Enter')
    if (wanted.test(await input.inputValue())) return
  }
  throw new Error(`could not choose "${query}" in "${label}"`)
}

async function press(page: Page, name: string | RegExp, times = 1) {
  const button = page.getByRole('button', { name, exact: typeof name === 'string' })
  for (let i = 0; i < times; i++) {
    await button.focus()
    await page.keyboard.press('Enter')
  }
}

const KEY_NAMES: Partial<Record<KeypadKey, string>> = { enter: 'OK', down: 'Down', back: 'Back' }

/** Presses a keypad button with Enter, each press checked in the saved attempt (see PanelDriver.until). */
async function pressKeypad(panel: PanelDriver, key: KeypadKey, times: number) {
  const button = panel.page.getByRole('button', { name: `Keypad ${KEY_NAMES[key]}`, exact: true })
  for (let i = 0; i < times; i++) {
    await panel.until(await panel.keypadEffect(key), async () => {
      await button.focus()
      await panel.page.keyboard.press('Enter')
    })
  }
}

async function leaveFields(page: Page) {
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur())
}

async function rpm(page: Page) {
  const label = (await page.getByTestId('panel-canvas').getAttribute('aria-label')) ?? ''
  return Number(/(-?\d+) rpm/.exec(label)?.[1])
}

async function waitForLabel(page: Page, re: RegExp, timeout = 30_000) {
  await expect
    .poll(async () => page.getByTestId('panel-canvas').getAttribute('aria-label'), { timeout })
    .toMatch(re)
}

describe('commissioning raise/lower with the keyboard only', () => {
  const bed = panelTestBed({ width: 1600, height: 1000 })

  it('can be done and submitted without touching the canvas', async () => {
    const { page, panel } = await openPanel(bed, 'raise-lower-commissioning')

    // My own lock beside the supervisor's, then prove dead with the probe lists, the meter on V AC for the
    // line pairs and V DC for the bus.
    await press(page, 'Apply my lock to the disconnect')
    await waitForLabel(page, /disconnect off and locked\./)
    const pairs: [string, string][] = [
      ['incoming line 1', 'incoming line 2'],
      ['incoming line 2', 'incoming line 3'],
      ['incoming line 1', 'incoming line 3'],
      ['DC bus positive', 'DC bus negative'],
    ]
    for (const [red, black] of pairs) {
      const range = red.startsWith('DC bus') ? 'V DC' : 'V AC'
      await page.getByRole('button', { name: `Meter selector: ${range}` }).focus()
      await page.keyboard.press('Enter')
      await expect
        .poll(async () =>
          page.getByTestId('meter-mode').locator('button[aria-pressed="true"]').getAttribute('aria-label'),
        )
        .toBe(`Meter selector: ${range}`)
      await choose(page, 'Red probe (V+)', red)
      await choose(page, 'Black probe (COM)', black)
    }
    await page.getByRole('tab', { name: 'Values', exact: true }).focus()
    await page.keyboard.press('Enter')
    await expect.poll(async () => page.getByTestId('live-meter').textContent()).toMatch(/^\s*0\.00 V/)
    await screenshot(page, 'panel-keyboard-01-proved-dead')

    // Wire with the terminal picker.
    const wires: [string, string][] = [
      ['+24 V control supply', 'Infeed run / stop terminal 13'],
      ['Infeed run / stop terminal 13', 'Faster terminal 13'],
      ['Faster terminal 13', 'Slower terminal 13'],
      ['Infeed run / stop terminal 14', 'digital input 1'],
      ['Faster terminal 14', 'digital input 2'],
      ['Slower terminal 14', 'digital input 3'],
      ['digital-input common', '0 V control supply'],
    ]
    await page.getByRole('tab', { name: 'Wiring', exact: true }).focus()
    await page.keyboard.press('Enter')
    for (const [from, to] of wires) {
      await press(page, 'Add a wire…')
      await choose(page, 'From terminal', from)
      await choose(page, 'To terminal', to)
      await press(page, 'Add wire')
    }
    await expect(page.getByRole('list', { name: 'Wires' }).getByRole('listitem').count()).resolves.toBe(7)
    await screenshot(page, 'panel-keyboard-02-wired')

    await press(page, 'Remove my lock from the disconnect')
    await page.getByTestId('unlock-confirm').waitFor()
    await press(page, 'Remove my lock')
    await waitForLabel(page, /disconnect off\./)
    await press(page, 'Ask Rena Dubrovny to remove their lock')
    await waitForLabel(page, /No lock on the disconnect\./)
    await press(page, /^Disconnect: OFF/)
    await waitForLabel(page, /drive ready/)

    // Program with the keypad buttons (same key sequence as by mouse).
    const keys: [KeypadKey, number][] = [
      ['enter', 1],
      ['down', 1],
      ['enter', 2],
      ['down', 1],
      ['enter', 1],
      ['back', 1],
      ['down', 1],
      ['enter', 1],
      ['down', 1],
      ['enter', 1],
      ['down', 1],
      ['enter', 1],
      ['down', 1],
      ['enter', 1],
      ['down', 4],
      ['enter', 1],
      ['down', 1],
      ['enter', 1],
      ['down', 5],
      ['enter', 1],
      ['back', 1],
      ['down', 1],
      ['enter', 2],
      ['down', 1],
      ['enter', 1],
      ['back', 2],
    ]
    for (const [key, times] of keys) await pressKeypad(panel, key, times)
    await screenshot(page, 'panel-keyboard-03-programmed')

    // Run with the selector's letter, raise by holding F, trim with F / S taps.
    await leaveFields(page)
    await panel.until(panel.selectorEffect('runSwitch', 1), () => page.keyboard.press('i'))
    await waitForLabel(page, /drive (speeding up|running)/)
    await page.keyboard.down('f')
    await expect.poll(() => rpm(page), { timeout: 40_000, interval: 50 }).toBeGreaterThanOrEqual(1150)
    await page.keyboard.up('f')
    for (let i = 0; i < 20; i++) {
      await page.waitForTimeout(600)
      const now = await rpm(page)
      if (Math.abs(now - 1200) <= 12) break
      const key = now > 1200 ? 's' : 'f'
      await page.keyboard.down(key)
      await page.waitForTimeout(Math.min(400, Math.abs(now - 1200) * 6))
      await page.keyboard.up(key)
    }
    expect(Math.abs((await rpm(page)) - 1200)).toBeLessThanOrEqual(20)
    await screenshot(page, 'panel-keyboard-04-at-target')
    await press(page, '10× (simulated time 10 times faster)')
    await page.waitForTimeout(2500)
    await press(page, '1× (simulated time at real speed)')

    await leaveFields(page)
    await page.keyboard.down('s')
    await page.waitForTimeout(2500)
    await page.keyboard.up('s')
    await panel.until(panel.selectorEffect('runSwitch', 0), () => page.keyboard.press('i'))
    await waitForLabel(page, / 0 rpm/)

    await page.getByRole('tab', { name: 'Task', exact: true }).focus()
    await page.keyboard.press('Enter')
    await page.getByTestId('submit-attempt').focus()
    await page.keyboard.press('Enter')
    // The confirmation says what submitting does; Enter on its button submits.
    await page.getByTestId('confirm-submit-button').focus()
    await page.keyboard.press('Enter')
    const grade = page.getByTestId('attempt-grade')
    await grade.waitFor({ timeout: 30_000 })
    await grade.scrollIntoViewIfNeeded()
    await screenshot(page, 'panel-keyboard-05-graded')
    await expect(grade.textContent()).resolves.toMatch(/— passed/)
  }, 300_000)
})
