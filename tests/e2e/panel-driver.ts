// Drives the simulator panel in a browser the way an apprentice does: real pointer events on the
// canvas at the scene positions of terminals, buttons and keys (from the panel's own layout).
import type { Page } from 'playwright-core'
import { layoutPanel, SCENE_WIDTH, SCENE_HEIGHT } from '../../src/panel/layout'
import { probeTip } from '../../src/panel/hitTest'
import { pointOnCubic, wireCurve } from '../../src/panel/wireCurve'
import type { KeypadKey, PanelDevice, PanelLayout, Vec } from '../../src/panel/types'

export class PanelDriver {
  readonly layout: PanelLayout

  constructor(
    readonly page: Page,
    devices: PanelDevice[],
  ) {
    this.layout = layoutPanel(devices)
  }

  private async toPage(p: Vec): Promise<Vec> {
    const canvas = this.page.getByTestId('panel-canvas')
    // Centred, so no part of the scene sits under the app's sticky top bar.
    await canvas.evaluate((el) => el.scrollIntoView({ block: 'center' }))
    const box = await canvas.boundingBox()
    if (!box) throw new Error('the panel canvas is not visible')
    return { x: box.x + (p.x / SCENE_WIDTH) * box.width, y: box.y + (p.y / SCENE_HEIGHT) * box.height }
  }

  terminal(id: string): Vec {
    const t = this.layout.terminals[id]
    if (!t) throw new Error(`no terminal ${id} on the panel`)
    return t
  }

  async drag(from: Vec, to: Vec) {
    const a = await this.toPage(from)
    const b = await this.toPage(to)
    await this.page.mouse.move(a.x, a.y)
    await this.page.mouse.down()
    await this.page.mouse.move((a.x + b.x) / 2, Math.max(a.y, b.y) + 40, { steps: 4 })
    await this.page.mouse.move(b.x, b.y, { steps: 4 })
    await this.page.mouse.up()
  }

  async click(p: Vec) {
    const a = await this.toPage(p)
    await this.page.mouse.click(a.x, a.y)
  }

  async wire(from: string, to: string) {
    await this.drag(this.terminal(from), this.terminal(to))
  }

  /** A point on the drawn curve of the wire in position `lane` of the wiring list. */
  wirePoint(from: string, to: string, lane: number): Vec {
    return pointOnCubic(wireCurve(this.terminal(from), this.terminal(to), lane), 0.6)
  }

  /** Moves a probe from wherever it is (meter or a point) to a point, or back to the meter (null). */
  async probe(probe: 'red' | 'black', at: string | null, from: string | null) {
    const tip = probeTip(this.layout, probe, from)
    const target = at ? this.terminal(at) : this.layout.meter.holsters[probe]
    await this.drag({ x: tip.x, y: tip.y - 10 }, target)
  }

  async key(key: KeypadKey, times = 1) {
    const k = this.layout.drive.keys.find((x) => x.key === key)
    if (!k) throw new Error(`no keypad key ${key}`)
    for (let i = 0; i < times; i++)
      await this.click({ x: k.rect.x + k.rect.w / 2, y: k.rect.y + k.rect.h / 2 })
  }

  device(id: string): Vec {
    const d = this.layout.devices.find((x) => x.id === id)
    if (!d) throw new Error(`no device ${id}`)
    return d.actuator
  }

  async pressDevice(id: string) {
    const a = await this.toPage(this.device(id))
    await this.page.mouse.move(a.x, a.y)
    await this.page.mouse.down()
  }

  async release() {
    await this.page.mouse.up()
  }

  async disconnect() {
    const h = this.layout.disconnect.handle
    await this.toggleIsolation({ x: h.x + h.w / 2, y: h.y + h.h / 2 })
  }

  async lock() {
    const l = this.layout.disconnect.lock
    await this.toggleIsolation({ x: l.x + l.w / 2, y: l.y + l.h / 2 })
  }

  /**
   * Clicks the disconnect or its lock and waits until the panel reports the change. On a busy machine a
   * click can be lost; it is repeated once, only after the first has clearly had no effect.
   */
  private async toggleIsolation(at: Vec) {
    const isolation = (s: string) => /disconnect (on|off)( and locked)?/.exec(s)?.[0] ?? ''
    const before = isolation(await this.summary())
    for (const wait of [5_000, 15_000]) {
      await this.click(at)
      try {
        await this.waitFor((s) => isolation(s) !== before, wait)
        return
      } catch {
        // no change yet: click once more
      }
    }
    throw new Error(`clicking the disconnect at ${JSON.stringify(at)} changed nothing (still "${before}")`)
  }

  /** Lifts the probes from wherever they are and tests every line pair and the DC bus. */
  async proveDead(from: { red: string | null; black: string | null }) {
    await this.probe('red', 'drive.l1', from.red)
    await this.probe('black', 'drive.l2', from.black)
    await this.probe('black', 'drive.l3', 'drive.l2')
    await this.probe('red', 'drive.l2', 'drive.l1')
    await this.probe('red', 'drive.l1', 'drive.l2')
    await this.probe('red', 'drive.dcp', 'drive.l1')
    await this.probe('black', 'drive.dcn', 'drive.l3')
  }

  /** Switches off, locks, and waits (time sped up) until the DC bus is below 30 V. */
  async isolateAndDischarge() {
    await this.disconnect()
    await this.lock()
    await this.page.getByRole('tab', { name: 'Live values' }).click()
    await this.page.getByRole('button', { name: 'Time runs 60 times faster' }).click()
    const deadline = Date.now() + 60_000
    while (Date.now() < deadline) {
      const text = (await this.page.getByTestId('live-bus').textContent()) ?? ''
      if (Number(/(\d+) V/.exec(text)?.[1]) < 30) break
      await this.page.waitForTimeout(200)
    }
    await this.page.getByRole('button', { name: 'Time runs 1 times faster' }).click()
  }

  /** The canvas's accessible name, which states the drive's state and speed. */
  async summary(): Promise<string> {
    return (await this.page.getByTestId('panel-canvas').getAttribute('aria-label')) ?? ''
  }

  async rpm(): Promise<number> {
    const m = /(-?\d+) rpm/.exec(await this.summary())
    return m ? Number(m[1]) : NaN
  }

  async waitFor(predicate: (summary: string) => boolean, timeoutMs = 20_000) {
    const deadline = Date.now() + timeoutMs
    let last = ''
    while (Date.now() < deadline) {
      last = await this.summary()
      if (predicate(last)) return last
      await this.page.waitForTimeout(50)
    }
    throw new Error(`the panel never reached the expected state; last: ${last}`)
  }
}
