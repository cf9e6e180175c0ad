// What the panel shows besides its pixels, read the way a test can trust it: the canvas's accessible
// summary, the control buttons beside it (their names and pressed states), the probe fields, the
// wiring list, and the attempt log the page saves after every action. Each canvas gesture of the
// driver is checked against one of these, in words that go straight into a failure message.
import type { Page } from 'playwright-core'
import type { KeypadKey, PanelLayout, PointId, ProbeColour } from '../../src/simulator/scene/types'

/** The lifted probe's entry in the probe fields. */
const PROBE_LIFTED = 'Lifted (on the meter)'

interface SavedEvent {
  type: string
  [field: string]: unknown
}

export class PanelObserver {
  constructor(
    readonly page: Page,
    readonly layout: PanelLayout,
  ) {}

  /** The canvas's accessible name, which states the drive's state and speed, wires and isolation. */
  async summary(): Promise<string> {
    return (await this.page.getByTestId('panel-canvas').getAttribute('aria-label')) ?? ''
  }

  /** "disconnect on", "disconnect off" or "disconnect off and locked", as the summary says it. */
  async isolation(): Promise<string> {
    return /disconnect (on|off)( and locked)?/.exec(await this.summary())?.[0] ?? 'isolation not stated'
  }

  deviceLabel(id: string): string {
    const d = this.layout.devices.find((x) => x.id === id)
    if (!d) throw new Error(`no device ${id} on the panel`)
    return d.label
  }

  /** "Infeed run / stop at 1": the selector's position, from its control button's accessible name. */
  async selector(id: string): Promise<string> {
    const label = this.deviceLabel(id)
    const name = (await this.page.getByTestId(`control-device-${id}`).getAttribute('aria-label')) ?? ''
    const position = name.startsWith(`${label}: `) ? name.charAt(label.length + 2) : '?'
    return `${label} at ${position}`
  }

  /** "Faster held" or "Faster released", from the pushbutton's pressed state beside the canvas. */
  async pushbutton(id: string): Promise<string> {
    const pressed = await this.page.getByTestId(`control-device-${id}`).getAttribute('aria-pressed')
    return `${this.deviceLabel(id)} ${pressed === 'true' ? 'held' : 'released'}`
  }

  /** Where a probe is, from its field (which shows the point's name, or that it is lifted). */
  async probeAt(probe: ProbeColour): Promise<PointId | null> {
    const shown = await this.page.getByTestId(`probe-${probe}`).locator('input[role="combobox"]').inputValue()
    if (shown === PROBE_LIFTED) return null
    const spot = Object.values(this.layout.terminals).find((t) => t.name === shown)
    if (!spot) throw new Error(`the ${probe} probe field shows "${shown}", which is no point on the panel`)
    return spot.id
  }

  /** "red probe on L1" or "red probe on the meter". */
  async probe(probe: ProbeColour): Promise<string> {
    return probeWords(this.layout, probe, await this.probeAt(probe))
  }

  /** The wiring list, one "from → to" (terminal titles) per wire. */
  async wires(): Promise<string[]> {
    const titles = await this.page
      .getByRole('list', { name: 'Wires' })
      .locator('.v-list-item-title')
      .allTextContents()
    return titles.filter((t) => t.includes('→')).map((t) => t.slice(t.indexOf(':') + 1).trim())
  }

  wireWords(from: PointId, to: PointId): string {
    return `${this.title(from)} → ${this.title(to)}`
  }

  /** How many wires there are, and how many of them run from → to. */
  async wiresWith(from: PointId, to: PointId): Promise<{ total: number; same: number }> {
    const all = await this.wires()
    const wanted = this.wireWords(from, to)
    return { total: all.length, same: all.filter((w) => w === wanted).length }
  }

  /** The polite live region's latest announcement. */
  async announcement(): Promise<string> {
    return ((await this.page.getByTestId('announcer').textContent()) ?? '').trim()
  }

  /**
   * The attempt's event log as the page saved it in local storage (after every recorded action).
   * The keypad's menu is drawn only on the canvas, so this is where a key press can be seen.
   */
  async savedEvents(): Promise<SavedEvent[]> {
    return this.page.evaluate(() => {
      type Saved = { savedAt: string; events: SavedEvent[] }
      let newest: Saved | null = null
      for (let i = 0; i < localStorage.length; i++) {
        const key = localStorage.key(i) ?? ''
        if (!/^slipway\.attempt\.(practice|assignment)\.[^.]+$/.test(key)) continue
        const saved = JSON.parse(localStorage.getItem(key) ?? 'null') as Saved | null
        if (saved && (!newest || saved.savedAt > newest.savedAt)) newest = saved
      }
      return newest?.events ?? []
    })
  }

  /** How many presses of a keypad key the saved attempt has recorded. */
  async keypadPresses(key: KeypadKey): Promise<number> {
    return (await this.savedEvents()).filter((e) => e.type === 'keypad.key' && e.key === key).length
  }

  private title(id: PointId): string {
    const t = this.layout.terminals[id]
    if (!t) throw new Error(`no terminal ${id} on the panel`)
    return t.title
  }
}

export function probeWords(layout: PanelLayout, probe: ProbeColour, at: PointId | null): string {
  return `${probe} probe on ${at ? (layout.terminals[at]?.title ?? at) : 'the meter'}`
}

/** "3 wires, 1 of them +24 → Faster 13". */
export function wireCountWords(count: { total: number; same: number }, wire: string): string {
  return `${count.total} wires, ${count.same} of them ${wire}`
}

/** "4 presses of enter". */
export function keypadWords(key: KeypadKey, presses: number): string {
  return `${presses} presses of ${key}`
}
