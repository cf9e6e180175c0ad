// Drives the simulator panel in a browser the way an apprentice does: real pointer events on the
// canvas at the scene positions of terminals, buttons and keys (from the panel's own layout).
//
// On a loaded machine a canvas gesture can be lost (it lands while a dialog is still fading out or the
// layout is still moving), and a lost click shows up much later as a puzzling timeout. So every
// state-changing gesture here goes through `until`: it waits for the gesture's visible effect, repeats
// the gesture only when the page has settled and still shows exactly what it showed before, and
// otherwise fails at once, saying what it expected and what the panel shows.
import type { Page } from 'playwright-core'
import { layoutPanel } from '../../src/simulator/scene/layout'
import { probeTip } from '../../src/simulator/scene/hitTest'
import { pointOnCubic, wireCurve } from '../../src/simulator/scene/wireCurve'
import { METER_MODE_LABELS, type MeterMode } from '../../shared/model/meterModes'
import type {
  KeypadKey,
  PanelDevice,
  PanelLayout,
  PointId,
  ProbeColour,
  Vec,
} from '../../src/simulator/scene/types'
import { keypadWords, PanelObserver, probeWords, wireCountWords, type StartWire } from './panel-observe'

/** How long a gesture's effect may take to show before the gesture counts as lost. */
const EFFECT_WAIT_MS = 3_000
/** One gesture and at most two repeats. */
const TRIES = 3
/** How long the canvas may stay covered (a closing dialog or menu) before a gesture gives up. */
const CLEAR_WAIT_MS = 10_000

/** What a gesture should change, in the observer's words. */
export interface Effect {
  /** The gesture, for messages: "turning Infeed run / stop to 1". */
  action: string
  /** What the panel shows once the gesture has worked. */
  expected: string
  /** What the panel shows now. */
  observe: () => Promise<string>
}

export class PanelDriver {
  readonly layout: PanelLayout
  readonly state: PanelObserver
  private buttonHeld: string | null = null

  constructor(
    readonly page: Page,
    devices: PanelDevice[],
    startWires: readonly StartWire[] = [],
  ) {
    this.layout = layoutPanel(devices)
    this.state = new PanelObserver(page, this.layout, startWires)
  }

  /** Waits until the canvas is drawn and describes the panel (Pixi has started). */
  async ready() {
    await this.page.getByTestId('panel-canvas').waitFor({ timeout: 30_000 })
    await this.page.getByText('Starting the panel…').waitFor({ state: 'hidden', timeout: 30_000 })
    // "Panel: drive …" on a live attempt, "Replay at …: drive …" on a replay.
    await this.waitFor((s) => /^(Panel|Replay at [\d:.]+): drive /.test(s), 10_000)
  }

  /**
   * Does `gesture` until the panel shows `effect.expected`. The gesture is repeated (at most twice)
   * only when, after waiting and one more frame, the panel still shows what it showed before, so a
   * slow toggle is never doubled; any other outcome fails here, naming the gesture and both states.
   */
  async until(effect: Effect, gesture: () => Promise<void>, tries = TRIES) {
    const before = await effect.observe()
    if (before === effect.expected) {
      throw new Error(`${effect.action}: the panel already shows "${before}" before the gesture`)
    }
    let now = before
    for (let attempt = 1; attempt <= tries; attempt++) {
      await gesture()
      now = await this.poll(effect)
      if (now === effect.expected) return
      await this.settle()
      now = await effect.observe()
      if (now === effect.expected) return
      if (now !== before) break
      if (attempt < tries) console.log(`panel driver: ${effect.action} showed no effect (try ${attempt})`)
    }
    throw new Error(
      `${effect.action}: expected the panel to show "${effect.expected}" but it shows "${now}" (before: "${before}")`,
    )
  }

  /** One click at a scene point, checked against its effect (see `until`). */
  async clickUntil(at: Vec, effect: Effect) {
    await this.until(effect, () => this.clickAt(at))
  }

  terminal(id: string): Vec {
    const t = this.layout.terminals[id]
    if (!t) throw new Error(`no terminal ${id} on the panel`)
    return t
  }

  device(id: string): Vec {
    const d = this.layout.devices.find((x) => x.id === id)
    if (!d) throw new Error(`no device ${id}`)
    return d.actuator
  }

  /** A selector (run / stop, direction …) standing at a position. */
  selectorEffect(id: string, position: 0 | 1): Effect {
    const label = this.state.deviceLabel(id)
    return {
      action: `turning ${label} (${id}) to ${position}`,
      expected: `${label} at ${position}`,
      observe: () => this.state.selector(id),
    }
  }

  /** One more press of a keypad key in the saved attempt than it has now. */
  async keypadEffect(key: KeypadKey): Promise<Effect> {
    const pressed = await this.state.keypadPresses(key)
    return {
      action: `pressing keypad ${key}`,
      expected: keypadWords(key, pressed + 1),
      observe: async () => keypadWords(key, await this.state.keypadPresses(key)),
    }
  }

  /** Turns a selector to a position by clicking its knob. */
  async setSelector(id: string, position: 0 | 1) {
    await this.clickUntil(this.device(id), this.selectorEffect(id, position))
  }

  /** Presses a pushbutton on the canvas and keeps holding it until `release`. */
  async pressDevice(id: string) {
    const label = this.state.deviceLabel(id)
    await this.until(
      {
        action: `pressing ${label} (${id})`,
        expected: `${label} held`,
        observe: () => this.state.pushbutton(id),
      },
      async () => {
        if (this.buttonHeld) await this.page.mouse.up()
        const a = await this.pagePoint(this.device(id))
        await this.page.mouse.move(a.x, a.y)
        await this.page.mouse.down()
        this.buttonHeld = id
      },
    )
  }

  /** Lets go of the pushbutton held with `pressDevice` (a second mouse-up would do nothing). */
  async release() {
    const id = this.buttonHeld
    if (!id) throw new Error('release() without a pushbutton held by pressDevice()')
    const label = this.state.deviceLabel(id)
    await this.until(
      {
        action: `releasing ${label} (${id})`,
        expected: `${label} released`,
        observe: () => this.state.pushbutton(id),
      },
      async () => {
        await this.page.mouse.up()
        this.buttonHeld = null
      },
      1,
    )
  }

  async switchDisconnect(to: 'on' | 'off') {
    const h = this.layout.disconnect.handle
    const locked = (await this.state.isolation()).endsWith('and locked')
    if (to === 'on' && locked) throw new Error('switching the disconnect on: it is still locked')
    await this.clickUntil(
      { x: h.x + h.w / 2, y: h.y + h.h / 2 },
      {
        action: `switching the disconnect ${to}`,
        expected: `disconnect ${to}${locked ? ' and locked' : ''}`,
        observe: () => this.state.isolation(),
      },
    )
  }

  async applyLock() {
    await this.clickLock('applying the lock to the disconnect', 'disconnect off and locked')
  }

  /** Clicks the lock point, which asks "Remove your lock?", and confirms in the dialog. */
  async removeLock() {
    const l = this.layout.disconnect.lock
    const dialog = this.page.getByTestId('unlock-confirm')
    await this.clickUntil(
      { x: l.x + l.w / 2, y: l.y + l.h / 2 },
      {
        action: 'asking to remove the lock from the disconnect',
        expected: 'asked',
        observe: async () => ((await dialog.isVisible()) ? 'asked' : 'not asked'),
      },
    )
    await this.until(
      {
        action: 'confirming the lock’s removal',
        expected: 'disconnect off',
        observe: () => this.state.isolation(),
      },
      () => dialog.getByRole('button', { name: 'Remove my lock' }).click(),
      1,
    )
  }

  /** Asks the story's supervisor to remove their lock (a button: the lock is theirs, not the apprentice's). */
  async askSupervisorToUnlock() {
    const button = this.page.getByTestId('control-supervisor-lock-ask')
    await this.until(
      {
        action: 'asking the supervisor to remove their lock',
        expected: 'gone',
        observe: async () => ((await button.count()) === 0 ? 'gone' : 'on'),
      },
      () => button.click(),
      1,
    )
  }

  private async clickLock(action: string, expected: string) {
    const l = this.layout.disconnect.lock
    await this.clickUntil(
      { x: l.x + l.w / 2, y: l.y + l.h / 2 },
      {
        action,
        expected,
        observe: () => this.state.isolation(),
      },
    )
  }

  /**
   * Draws a wire on the canvas from one terminal to another: by dragging, or by tapping one terminal and
   * then the other ('taps'; with a mouse, or with a finger when the page has a touch screen).
   */
  async wire(from: PointId, to: PointId, how: 'drag' | 'taps' | 'touch' = 'drag') {
    const words = this.state.wireWords(from, to)
    const before = await this.state.wiresWith(from, to)
    await this.until(
      {
        action: `wiring ${words} (${how})`,
        expected: wireCountWords({ total: before.total + 1, same: before.same + 1 }, words),
        observe: async () => wireCountWords(await this.state.wiresWith(from, to), words),
      },
      async () => {
        if (how === 'drag') return this.drag(this.terminal(from), this.terminal(to))
        // A repeat after a lost second tap would find the wire still armed: let it go first.
        await this.page.keyboard.press('Escape')
        for (const end of [from, to]) {
          const p = await this.pagePoint(this.terminal(end))
          if (how === 'touch') await this.page.touchscreen.tap(p.x, p.y)
          else await this.page.mouse.click(p.x, p.y)
        }
      },
    )
  }

  /** Clicks the drawn curve of a wire (found by its place in the wiring list) to select it. */
  async selectWire(from: PointId, to: PointId) {
    const words = this.state.wireWords(from, to)
    const lane = (await this.state.wires()).indexOf(words)
    if (lane < 0) throw new Error(`selecting the wire ${words}: there is no such wire`)
    await this.clickUntil(pointOnCubic(wireCurve(this.terminal(from), this.terminal(to), lane), 0.6), {
      action: `selecting the wire ${words}`,
      expected: `selected: ${await this.state.wireMarker(lane)}`,
      observe: () => this.state.selectedWire(),
    })
  }

  /** Moves a probe from wherever it is to a point, or back to the meter (null). */
  async probe(probe: ProbeColour, at: PointId | null) {
    await this.until(
      {
        action: `moving the ${probe} probe to ${at ?? 'the meter'}`,
        expected: probeWords(this.layout, probe, at),
        observe: () => this.state.probe(probe),
      },
      async () => {
        const tip = probeTip(this.layout, probe, await this.state.probeAt(probe))
        const target = at ? this.terminal(at) : this.layout.meter.holsters[probe]
        await this.drag({ x: tip.x, y: tip.y - 10 }, target)
      },
    )
  }

  /** Presses a keypad key on the canvas, each press checked in the saved attempt. */
  async key(key: KeypadKey, times = 1) {
    const k = this.layout.drive.keys.find((x) => x.key === key)
    if (!k) throw new Error(`no keypad key ${key}`)
    const centre = { x: k.rect.x + k.rect.w / 2, y: k.rect.y + k.rect.h / 2 }
    for (let i = 0; i < times; i++) await this.clickUntil(centre, await this.keypadEffect(key))
  }

  /** Turns the meter's selector by clicking its key on the canvas, checked beside the canvas. */
  async meterMode(mode: MeterMode) {
    const key = this.layout.meter.selector.find((k) => k.mode === mode)
    if (!key) throw new Error(`no meter key for ${mode}`)
    await this.clickUntil(
      { x: key.rect.x + key.rect.w / 2, y: key.rect.y + key.rect.h / 2 },
      {
        action: `turning the meter to ${METER_MODE_LABELS[mode]}`,
        expected: METER_MODE_LABELS[mode],
        observe: () => this.state.meterMode(),
      },
    )
  }

  /**
   * Tests every line pair on V AC and the DC bus on V DC, lifting the probes from wherever they are
   * (the meter is turned to each range first, as an electrician would).
   */
  async proveDead() {
    await this.meterMode('acVolts')
    await this.probe('red', 'drive.l1')
    await this.probe('black', 'drive.l2')
    await this.probe('black', 'drive.l3')
    await this.probe('red', 'drive.l2')
    await this.probe('red', 'drive.l1')
    await this.meterMode('dcVolts')
    await this.probe('red', 'drive.dcp')
    await this.probe('black', 'drive.dcn')
  }

  /** Switches off, locks, and waits (time sped up) until the DC bus is below 30 V. */
  async isolateAndDischarge() {
    await this.switchDisconnect('off')
    await this.applyLock()
    await this.openSheet('Values')
    await this.setTimeSpeed(60)
    const bus = async () =>
      Number(/(\d+) V/.exec((await this.page.getByTestId('live-bus').textContent()) ?? '')?.[1])
    const deadline = Date.now() + 60_000
    while ((await bus()) >= 30) {
      if (Date.now() > deadline)
        throw new Error(`the DC bus is still at ${await bus()} V after a minute at 60×`)
      await this.page.waitForTimeout(200)
    }
    await this.setTimeSpeed(1)
  }

  /** Opens the task sheet (if it is hidden) at one of its tabs. */
  async openSheet(tab: 'Task' | 'Wiring' | 'Schematic' | 'Settings' | 'Values' | 'Timeline') {
    const toggle = this.page.getByTestId('toggle-sheet')
    if ((await toggle.getAttribute('aria-expanded')) !== 'true') await toggle.click()
    await this.page.getByRole('tab', { name: tab, exact: true }).click()
  }

  /** Hides the task sheet, where it lies over the panel. */
  async closeSheet() {
    const toggle = this.page.getByTestId('toggle-sheet')
    if ((await toggle.getAttribute('aria-expanded')) === 'true') await toggle.click()
  }

  /** Chooses how fast simulated time runs (a button in the workspace's bar). */
  async setTimeSpeed(times: 1 | 10 | 60) {
    const button = (n: number) =>
      this.page.getByRole('button', {
        name: n === 1 ? '1× (simulated time at real speed)' : `${n}× (simulated time ${n} times faster)`,
      })
    await this.until(
      {
        action: `setting simulated time to ${times}×`,
        expected: `time at ${times}×`,
        observe: async () =>
          ((await button(times).getAttribute('class')) ?? '').includes('v-btn--active')
            ? `time at ${times}×`
            : 'time at another speed',
      },
      () => button(times).click(),
    )
  }

  async summary(): Promise<string> {
    return this.state.summary()
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

  private async poll(effect: Effect): Promise<string> {
    const deadline = Date.now() + EFFECT_WAIT_MS
    let now = await effect.observe()
    while (now !== effect.expected && Date.now() < deadline) {
      await this.page.waitForTimeout(50)
      now = await effect.observe()
    }
    return now
  }

  /** Lets the page finish a frame, so whatever the last gesture caused has been rendered. */
  private async settle() {
    await this.page.evaluate(
      () => new Promise<void>((done) => requestAnimationFrame(() => setTimeout(done, 0))),
    )
  }

  /**
   * The page position of a scene point, once the canvas is scrolled into view and nothing covers that
   * point (the loading veil, a fading dialog or menu, the sticky bar, a message over the panel, which is
   * closed): a click there reaches the canvas.
   */
  private async pagePoint(p: Vec): Promise<Vec> {
    const canvas = this.page.getByTestId('panel-canvas')
    const deadline = Date.now() + CLEAR_WAIT_MS
    for (;;) {
      const spot = await canvas.evaluate(
        (el, { p }) => {
          // Centred, so no part of the scene sits under the app's sticky top bar.
          el.scrollIntoView({ block: 'center' })
          const r = el.getBoundingClientRect()
          // The panel's view (fit, zoom, pan), as the canvas states it.
          const scale = Number(el.getAttribute('data-scale'))
          const x = r.left + Number(el.getAttribute('data-x')) + p.x * scale
          const y = r.top + Number(el.getAttribute('data-y')) + p.y * scale
          const top = document.elementFromPoint(x, y)
          const cover = top === el ? null : top ? `${top.tagName.toLowerCase()}.${top.className}` : 'nothing'
          // A message over the panel (a safety warning, the narrow-screen note) is closed, as a person
          // closes what covers the terminal they want; the canvas is then asked again.
          const message = top?.closest('.panel-message')
          const close = message?.querySelector<HTMLElement>('.v-alert__close button, button.v-alert__close')
          close?.click()
          return { x, y, cover, closed: Boolean(close) }
        },
        { p },
      )
      if (!spot.cover) return spot
      if (spot.closed) continue
      if (Date.now() > deadline) {
        throw new Error(`the canvas point ${JSON.stringify(p)} stays covered by ${spot.cover}`)
      }
      await this.page.waitForTimeout(100)
    }
  }

  private async clickAt(p: Vec) {
    const a = await this.pagePoint(p)
    await this.page.mouse.click(a.x, a.y)
  }

  protected async drag(from: Vec, to: Vec) {
    const a = await this.pagePoint(from)
    const b = await this.pagePoint(to)
    await this.page.mouse.move(a.x, a.y)
    await this.page.mouse.down()
    await this.page.mouse.move((a.x + b.x) / 2, Math.max(a.y, b.y) + 40, { steps: 4 })
    await this.page.mouse.move(b.x, b.y, { steps: 4 })
    await this.page.mouse.up()
  }
}
