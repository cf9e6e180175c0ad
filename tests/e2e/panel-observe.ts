// What the panel shows besides its pixels, read the way a test can trust it: the canvas's accessible
// summary, the control buttons beside it (their names and pressed states), the probe fields, and the
// attempt log the page saves after every action (the wiring is read from it). Each canvas gesture of
// the driver is checked against one of these, in words that go straight into a failure message.
import type { Page } from 'playwright-core'
import type { KeypadKey, PanelLayout, PointId, ProbeColour } from '../../src/simulator/scene/types'
import { wireLabel } from '../../src/simulator/scene/wireColours'

/** The lifted probe's entry in the probe fields. */
const PROBE_LIFTED = 'Lifted (on the meter)'

interface SavedEvent {
  type: string
  [field: string]: unknown
}

/** A wire as the scenario starts with it or as a wire.added event records it. */
export interface StartWire {
  id: string
  from: string
  to: string
  colour: string
}

export class PanelObserver {
  constructor(
    readonly page: Page,
    readonly layout: PanelLayout,
    /** The wires the scenario starts with (they are in no event). */
    readonly startWires: readonly StartWire[] = [],
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

  /** The meter selector's position in words ("V AC"), from its pressed button beside the canvas. */
  async meterMode(): Promise<string> {
    const pressed = this.page.getByTestId('meter-mode').locator('button[aria-pressed="true"]')
    if (!(await pressed.count())) return 'no position'
    return ((await pressed.first().getAttribute('aria-label')) ?? '').replace(/^Meter selector: /, '')
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

  /** The wires now, in the order they were added, from the saved log. */
  private async wireEvents(): Promise<StartWire[]> {
    const wires: StartWire[] = [...this.startWires]
    for (const e of await this.savedEvents()) {
      if (e.type === 'wire.added') wires.push(e as unknown as (typeof wires)[number])
      if (e.type === 'wire.removed')
        wires.splice(
          wires.findIndex((w) => w.id === e.id),
          1,
        )
    }
    return wires
  }

  /** The wiring, one "from → to" (terminal titles) per wire, as the Wiring tab lists it. */
  async wires(): Promise<string[]> {
    return (await this.wireEvents()).map((w) => this.wireWords(w.from, w.to))
  }

  /** The marker of the wire at a place in the list ("W1 BU"). */
  async wireMarker(lane: number): Promise<string> {
    const w = (await this.wireEvents())[lane]
    return w ? wireLabel(w.id, w.colour, lane) : 'no such wire'
  }

  /** "selected: W1 BU" or "no wire selected", from the canvas's summary. */
  async selectedWire(): Promise<string> {
    const m = / Wire (\S+ \S+) selected\./.exec(await this.summary())
    return m ? `selected: ${m[1]}` : 'no wire selected'
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
      // Header `slipway.attempt.<practice|assignment>.<id>`, the log in chunks `<header key>.log.<n>`.
      type Header = { version: number; savedAt: string; chunks: number; events?: SavedEvent[] }
      let newest: { key: string; header: Header } | null = null
      for (let i = 0; i < localStorage.length; i++) {
        const key = localStorage.key(i) ?? ''
        if (!/^slipway\.attempt\.(practice|assignment)\.[^.]+$/.test(key)) continue
        const header = JSON.parse(localStorage.getItem(key) ?? 'null') as Header | null
        if (header && (!newest || header.savedAt > newest.header.savedAt)) newest = { key, header }
      }
      if (!newest) return []
      if (newest.header.version === 1) return newest.header.events ?? []
      const events: SavedEvent[] = []
      for (let n = 0; n < newest.header.chunks; n++) {
        events.push(...(JSON.parse(localStorage.getItem(`${newest.key}.log.${n}`) ?? '[]') as SavedEvent[]))
      }
      return events
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
