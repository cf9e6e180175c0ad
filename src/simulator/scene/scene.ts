// The panel scene in pixi.js: built once from the layout, then redrawn only where the view changed.
import { Container, Graphics, Text, type TextStyleOptions } from 'pixi.js'
import { METER_MODE_KEY_LABELS } from '@shared/model/meterModes'
import { PROVER_AC_VOLTS, PROVER_VOLTS } from '@shared/model/points'
import { probeTip } from './hitTest'
import { PALETTE as C } from './palette'
import { TERMINAL_LABEL_SIZE, TERMINAL_RADIUS } from './layout'
import { PROBE_BODY, probeLead } from './probeLeads'
import type { PanelLayout, PointId, Rect } from './types'
import type { PanelView, StatusLamp } from './view'
import { wireColour } from './wireColours'
import { wireCurve } from './wireCurve'
import { placeWireLabels, WIRE_LABEL_HEIGHT, WIRE_LABEL_WIDTH } from './wireLabels'

const FONT = 'Atkinson Hyperlegible, DejaVu Sans, sans-serif'
const MONO = 'DejaVu Sans Mono, monospace'
/** The shaft is drawn slowed down: at 25 rev/s a true-speed key mark would strobe at 60 frames/s. */
export const SHAFT_VIEW_SLOWDOWN = 30

const LAMP: Record<StatusLamp, number> = {
  off: C.lampOff,
  charging: C.lampCharging,
  ready: C.lampReady,
  running: C.lampRunning,
  alarm: C.lampAlarm,
  fault: C.lampFault,
}

function text(value: string, style: TextStyleOptions, x: number, y: number, anchor = 0.5): Text {
  const t = new Text({ text: value, style: { fontFamily: FONT, ...style } })
  t.anchor.set(anchor, 0.5)
  t.position.set(x, y)
  return t
}

/**
 * What a lock's tag says, shortened to the tag's width (the accessible text has it in full). A lock the
 * exercise starts with carries no written tag: it is the apprentice's own, so it says so.
 */
function lockTagLines(name: string | null, last?: string): string[] {
  const short = (v: string) => (v.length > 16 ? `${v.slice(0, 15)}…` : v)
  return ['DO NOT OPERATE', name ? short(name) : 'your own lock', last ?? '']
}

function box(g: Graphics, r: Rect, fill: number, edge: number, radius = 8) {
  g.roundRect(r.x, r.y, r.w, r.h, radius).fill(fill).stroke({ width: 2, color: edge })
}

/** Above this texture resolution the still parts are drawn as vectors each frame instead of cached. */
const MAX_CACHE_RESOLUTION = 2.5

export class PanelScene {
  readonly root = new Container()
  /** What never changes (enclosures, printing, terminals): drawn once into a texture and reused. */
  private readonly staticLayer = new Container()
  private readonly wires = new Container()
  private readonly devices = new Graphics()
  private readonly disconnectHandle = new Container()
  private readonly disconnectArm = new Graphics()
  private readonly lock = new Graphics()
  private readonly lamp = new Graphics()
  private readonly chargeLamp = new Graphics()
  private readonly tagTexts: Text[] = []
  private readonly highlight = new Graphics()
  private readonly shaft = new Container()
  private readonly probes = new Graphics()
  private readonly meterSelector = new Graphics()
  private readonly meterSelectorLabels = new Map<string, Text>()
  private readonly displayLines: Text[] = []
  private readonly meterText: Text
  private readonly nameplateText: Text
  private readonly disconnectText: Text
  private readonly deviceStateTexts = new Map<string, Text>()
  private shaftAngle = 0
  private changed = false
  private rpm = 0
  private keys: Record<string, string> = {}
  private textResolution = 0

  constructor(private readonly layout: PanelLayout) {
    const base = new Graphics()
    this.root.addChild(this.staticLayer)
    this.staticLayer.addChild(base)
    this.drawBackplate(base)
    this.drawDrive(base)
    this.drawStation(base)
    this.drawDisconnect(base)
    this.drawMotor(base)
    this.drawProver(base)
    this.drawMeter(base)
    this.drawTerminals(base)

    const d = layout.drive.display
    for (let i = 0; i < 4; i++) {
      const line = new Text({ text: '', style: { fontFamily: MONO, fontSize: 17, fill: C.displayText } })
      line.position.set(d.x + 12, d.y + 10 + i * 28)
      this.displayLines.push(line)
      this.root.addChild(line)
    }
    const m = layout.meter.display
    this.meterText = text(
      '---',
      { fontFamily: MONO, fontSize: 26, fill: C.text },
      m.x + m.w / 2,
      m.y + m.h / 2,
    )
    // One tag per lock: the supervisor's (left) and the apprentice's own (right).
    for (let i = 0; i < 2; i++) {
      const tag = new Text({
        text: '',
        style: { fontFamily: FONT, fontSize: 9, fill: C.text, lineHeight: 11, align: 'center' },
      })
      tag.anchor.set(0.5, 0)
      this.tagTexts.push(tag)
    }
    const np = layout.motor.nameplate
    this.nameplateText = new Text({
      text: '',
      style: { fontFamily: MONO, fontSize: 11, fill: C.text, lineHeight: 16 },
    })
    this.nameplateText.position.set(np.x + 10, np.y + 24)
    const h = layout.disconnect.handle
    this.disconnectText = text(
      'O  OFF',
      { fontSize: 16, fill: C.text, fontWeight: 'bold' },
      h.x + h.w / 2,
      h.y - 14,
    )

    for (const dev of layout.devices) {
      const t = text(
        '',
        { fontSize: 11, fill: C.muted, align: 'center', lineHeight: 14 },
        dev.actuator.x,
        dev.actuator.y + dev.actuator.r + 40,
      )
      this.deviceStateTexts.set(dev.id, t)
      this.root.addChild(t)
    }

    for (const key of layout.meter.selector) {
      const label = text(
        METER_MODE_KEY_LABELS[key.mode],
        { fontSize: 12, fill: C.text, fontWeight: 'bold' },
        key.rect.x + key.rect.w / 2,
        key.rect.y + key.rect.h / 2,
      )
      this.meterSelectorLabels.set(key.mode, label)
    }
    this.root.addChild(this.meterSelector, ...this.meterSelectorLabels.values())

    this.root.addChild(
      this.meterText,
      this.nameplateText,
      this.disconnectText,
      this.disconnectHandle,
      this.lock,
      this.lamp,
      this.chargeLamp,
      ...this.tagTexts,
      this.shaft,
      this.devices,
      this.wires,
      this.highlight,
      this.probes,
    )
    this.buildShaft()
    this.disconnectHandle.addChild(this.disconnectArm)
  }

  /** Redraws only the parts whose inputs changed since the last call; says whether anything did. */
  update(view: PanelView): boolean {
    this.changed = false
    this.rpm = view.rpm
    this.when('wires', JSON.stringify([view.wires, view.selectedWire, view.draftWire]), () =>
      this.drawWires(view),
    )
    this.when('devices', JSON.stringify(view.devices), () => this.drawDevices(view))
    this.when('power', JSON.stringify(view.power), () => this.drawPower(view))
    this.when('display', view.display.join('\n'), () => view.display.forEach((l, i) => this.setLine(i, l)))
    this.when('lamp', `${view.lamp}|${view.chargeLamp}`, () => this.drawLamps(view))
    this.when('nameplate', view.nameplate.join('\n'), () => {
      this.nameplateText.text = view.nameplate.join('\n')
    })
    this.when('probes', JSON.stringify([view.probes, view.probeDrag]), () => this.drawProbes(view))
    this.when('meter', view.meterText, () => {
      this.meterText.text = view.meterText
    })
    this.when('meterMode', view.meterMode, () => this.drawMeterSelector(view.meterMode))
    this.when('highlight', `${view.highlight}|${view.armed}`, () =>
      this.drawHighlight(view.highlight, view.armed),
    )
    return this.changed
  }

  /** Per frame: only the shaft turns. Says whether it moved (so the frame needs drawing). */
  tick(dtMs: number): boolean {
    if (this.rpm === 0) return false
    this.shaftAngle =
      (this.shaftAngle + ((this.rpm / 60) * 2 * Math.PI * dtMs) / 1000 / SHAFT_VIEW_SLOWDOWN) % (2 * Math.PI)
    this.shaft.rotation = this.shaftAngle
    return true
  }

  private when(part: string, key: string, redraw: () => void) {
    if (this.keys[part] === key) return
    this.keys[part] = key
    this.changed = true
    redraw()
  }

  private setLine(i: number, value: string) {
    if (this.displayLines[i] && this.displayLines[i].text !== value) this.displayLines[i].text = value
  }

  private drawBackplate(g: Graphics) {
    g.rect(0, 0, this.layout.width, this.layout.height).fill(C.backplate)
    for (let x = 10; x < this.layout.width; x += 40) g.moveTo(x, 0).lineTo(x, this.layout.height)
    g.stroke({ width: 1, color: C.backplateLine, alpha: 0.6 })
    const w = this.layout.wireway
    g.roundRect(w.x, w.y, w.w, w.h, 6).stroke({ width: 1, color: C.stationEdge, alpha: 0.4 })
    this.staticLayer.addChild(
      text('wireway', { fontSize: 11, fill: C.muted }, w.x + w.w - 30, w.y + w.h - 10),
    )
  }

  private drawDrive(g: Graphics) {
    const { rect, display, keys, controlStrip, powerStrip } = this.layout.drive
    box(g, rect, C.enclosure, C.enclosureEdge, 12)
    this.staticLayer.addChild(
      text(
        'VARIABLE-FREQUENCY DRIVE  ·  Slipway bench unit',
        { fontSize: 13, fill: C.enclosureText },
        480,
        90,
      ),
    )
    g.roundRect(powerStrip.x, powerStrip.y, powerStrip.w, powerStrip.h, 4).fill(C.strip)
    g.roundRect(controlStrip.x, controlStrip.y, controlStrip.w, controlStrip.h, 4).fill(C.strip)
    box(g, display, C.display, 0x000000, 6)
    for (const k of keys) {
      const fill = k.key === 'run' ? 0x3f7d58 : k.key === 'stop' ? 0x9a3b3b : C.key
      box(g, k.rect, fill, C.enclosureEdge, 6)
      this.staticLayer.addChild(
        text(
          k.label,
          { fontSize: 13, fill: C.keyText, fontWeight: 'bold' },
          k.rect.x + k.rect.w / 2,
          k.rect.y + k.rect.h / 2,
        ),
      )
    }
    // Stored-energy caution on the enclosure (our wording).
    g.roundRect(255, 268, 230, 86, 4).fill(C.caution).stroke({ width: 2, color: 0x000000 })
    const caution = new Text({
      text: '⚠ CAUTION — STORED ENERGY\nDC bus capacitors stay charged after\nthe supply is off. Isolate, lock out,\nwait, then prove absence of voltage.',
      style: { fontFamily: FONT, fontSize: 11, fill: C.cautionText, lineHeight: 15 },
    })
    caution.position.set(262, 274)
    this.staticLayer.addChild(caution)
    this.staticLayer.addChild(text('CHARGE', { fontSize: 10, fill: C.enclosureText }, 610, 250))
    this.staticLayer.addChild(
      text('STATUS', { fontSize: 10, fill: C.enclosureText }, this.layout.drive.statusLamp.x, 234),
    )
  }

  private drawStation(g: Graphics) {
    const s = this.layout.station
    box(g, s, C.station, C.stationEdge, 10)
    this.staticLayer.addChild(
      text('CONTROL STATION', { fontSize: 13, fill: C.text, fontWeight: 'bold' }, s.x + s.w / 2, s.y + 16),
    )
    g.roundRect(s.x + 8, 372, s.w - 16, 56, 4).fill(C.strip)
    for (const d of this.layout.devices) {
      const { x, y, r } = d.actuator
      g.circle(x, y, r + 8)
        .fill(0xb9c0c7)
        .stroke({ width: 2, color: C.stationEdge })
      this.staticLayer.addChild(
        text(d.label, { fontSize: 12, fill: C.text, fontWeight: 'bold' }, x, y + r + 18),
      )
      // The device's name over its terminal group on the strip.
      const first = this.layout.terminals[d.terminals[0]]
      const last = this.layout.terminals[d.terminals[d.terminals.length - 1]]
      g.moveTo(first.x - 6, 370)
        .lineTo(last.x + 6, 370)
        .stroke({ width: 1, color: C.text })
      this.staticLayer.addChild(
        text(shortName(d.label), { fontSize: 10, fill: C.text }, (first.x + last.x) / 2, 361),
      )
    }
  }

  private drawDisconnect(g: Graphics) {
    const { rect, lock, handle } = this.layout.disconnect
    box(g, rect, 0xd0d5da, C.stationEdge, 10)
    g.circle(handle.x + handle.w / 2, handle.y + handle.h / 2, handle.w / 2).fill(0x2b2b2b)
    this.staticLayer.addChild(
      text(
        'SUPPLY DISCONNECT',
        { fontSize: 12, fill: C.text, fontWeight: 'bold' },
        rect.x + rect.w / 2,
        rect.y + 16,
      ),
    )
    g.roundRect(lock.x, lock.y, lock.w, lock.h, 4).stroke({ width: 2, color: C.muted })
    this.staticLayer.addChild(
      // Above the hasp: the tags hang below it.
      text('lock point', { fontSize: 10, fill: C.muted }, lock.x + lock.w / 2, lock.y - 8),
    )
  }

  private drawMotor(g: Graphics) {
    const { rect, shaft, shaftRadius, nameplate } = this.layout.motor
    box(g, rect, 0xdde2e6, C.stationEdge, 10)
    this.staticLayer.addChild(
      text(
        'MOTOR (drive end)',
        { fontSize: 12, fill: C.text, fontWeight: 'bold' },
        rect.x + rect.w / 2,
        rect.y + 16,
      ),
    )
    g.circle(shaft.x, shaft.y, shaftRadius + 14).fill(C.motorDark)
    g.circle(shaft.x, shaft.y, shaftRadius).fill(C.motor)
    box(g, nameplate, C.nameplate, 0x8d8471, 4)
    this.staticLayer.addChild(
      text(
        'NAMEPLATE',
        { fontSize: 10, fill: C.muted, fontWeight: 'bold' },
        nameplate.x + nameplate.w / 2,
        nameplate.y + 11,
      ),
    )
  }

  /** The proving unit: a battery box with its two outputs and their common, for live–dead–live. */
  private drawProver(g: Graphics) {
    const { rect } = this.layout.prover
    box(g, rect, C.proverBody, C.stationEdge, 8)
    const mid = rect.x + rect.w / 2
    this.staticLayer.addChild(
      text('METER PROVING UNIT', { fontSize: 12, fill: C.text, fontWeight: 'bold' }, mid, rect.y + 16),
      text(
        `Known live source (battery)\n${PROVER_VOLTS} V DC  ·  ${PROVER_AC_VOLTS} V AC\nCheck the meter before and after`,
        { fontSize: 10, fill: C.text, align: 'center' },
        mid,
        rect.y + 50,
      ),
    )
  }

  private buildShaft() {
    const { shaft, shaftRadius } = this.layout.motor
    const g = new Graphics()
    g.circle(0, 0, shaftRadius * 0.45)
      .fill(0xb0bac3)
      .stroke({ width: 2, color: 0x39424a })
    g.rect(-5, -shaftRadius * 0.45, 10, 14).fill(0x222222) // keyway, so rotation is visible
    for (let i = 0; i < 6; i++) {
      const a = (i / 6) * Math.PI * 2
      g.moveTo(Math.cos(a) * shaftRadius * 0.55, Math.sin(a) * shaftRadius * 0.55)
      g.lineTo(Math.cos(a) * shaftRadius * 0.92, Math.sin(a) * shaftRadius * 0.92)
    }
    g.stroke({ width: 6, color: 0x9aa5ae, cap: 'round' })
    this.shaft.addChild(g)
    this.shaft.position.set(shaft.x, shaft.y)
  }

  /** The selector's buttons, the chosen position filled dark with light lettering. */
  private drawMeterSelector(mode: PanelView['meterMode']) {
    const g = this.meterSelector.clear()
    for (const key of this.layout.meter.selector) {
      const on = key.mode === mode
      box(g, key.rect, on ? C.meterKeyOn : C.meterKey, C.meterEdge, 4)
      const label = this.meterSelectorLabels.get(key.mode)
      if (label) label.style.fill = on ? C.meterKey : C.text
    }
  }

  private drawMeter(g: Graphics) {
    const { rect, display, holsters } = this.layout.meter
    box(g, rect, C.meterBody, C.meterEdge, 14)
    this.staticLayer.addChild(
      text(
        'MULTIMETER',
        { fontSize: 12, fill: C.text, fontWeight: 'bold' },
        rect.x + rect.w / 2,
        rect.y + 16,
      ),
    )
    box(g, display, C.meterDisplay, 0x333333, 4)
    this.staticLayer.addChild(
      text(
        'Drag a probe onto any\nterminal; drop it here\nto lift it.',
        { fontSize: 11, fill: C.text, align: 'center' },
        rect.x + rect.w / 2,
        496,
      ),
    )
    for (const probe of ['red', 'black'] as const) {
      const h = holsters[probe]
      g.circle(h.x, h.y + 18, 9).fill(probe === 'red' ? C.probeRed : C.probeBlack)
      this.staticLayer.addChild(
        text(probe === 'red' ? 'V+ (red)' : 'COM (black)', { fontSize: 10, fill: C.text }, h.x, h.y + 36),
      )
    }
  }

  private drawTerminals(g: Graphics) {
    for (const t of Object.values(this.layout.terminals)) {
      g.circle(t.x, t.y, TERMINAL_RADIUS).fill(C.screw).stroke({ width: 1.5, color: C.screwEdge })
      g.moveTo(t.x - 4, t.y - 4)
        .lineTo(t.x + 4, t.y + 4)
        .stroke({ width: 1.5, color: C.screwEdge })
      const labelY = t.group === 'power' ? t.y + 22 : t.y - 22
      const fill = t.group === 'power' ? C.enclosureText : t.group === 'prover' ? C.text : C.stripText
      this.staticLayer.addChild(
        text(t.label, { fontSize: TERMINAL_LABEL_SIZE, fill, fontWeight: 'bold' }, t.x, labelY),
      )
    }
  }

  private drawWires(view: PanelView) {
    for (const child of this.wires.removeChildren()) child.destroy({ children: true })
    const g = new Graphics()
    this.wires.addChild(g)
    const labels: Text[] = []
    const drawn = view.wires.flatMap((w, lane) => {
      const a = this.layout.terminals[w.from]
      const b = this.layout.terminals[w.to]
      return a && b ? [{ wire: w, lane, curve: wireCurve(a, b, lane) }] : []
    })
    for (const { wire, curve } of drawn) {
      if (view.selectedWire === wire.id) this.curve(g, curve, 10, C.selected)
      this.curve(g, curve, 6, 0x111111)
      this.curve(g, curve, 4, wireColour(wire.colour).hex)
    }
    // Tags are drawn over every wire, each slid along its own curve clear of the others.
    placeWireLabels(drawn).forEach((at, i) => {
      g.roundRect(
        at.x - WIRE_LABEL_WIDTH / 2,
        at.y - WIRE_LABEL_HEIGHT / 2,
        WIRE_LABEL_WIDTH,
        WIRE_LABEL_HEIGHT,
        3,
      )
        .fill(0xffffff)
        .stroke({ width: 1, color: 0x333333 })
      const label = text(
        drawn[i].wire.label,
        { fontSize: 10, fill: 0x111111, fontWeight: 'bold' },
        at.x,
        at.y,
      )
      if (this.textResolution) label.resolution = this.textResolution
      labels.push(label)
    })
    if (view.draftWire) {
      const a = this.layout.terminals[view.draftWire.from]
      if (a) {
        const c = wireCurve(a, view.draftWire.at, view.wires.length)
        this.curve(g, c, 4, wireColour(view.draftWire.colour).hex, 0.7)
      }
    }
    if (labels.length) this.wires.addChild(...labels)
  }

  private curve(g: Graphics, c: ReturnType<typeof wireCurve>, width: number, color: number, alpha = 1) {
    g.moveTo(c.p0.x, c.p0.y)
      .bezierCurveTo(c.p1.x, c.p1.y, c.p2.x, c.p2.y, c.p3.x, c.p3.y)
      .stroke({ width, color, alpha, cap: 'round' })
  }

  private drawDevices(view: PanelView) {
    const g = this.devices.clear()
    for (const d of this.layout.devices) {
      const state = view.devices[d.id] ?? {}
      const { x, y, r } = d.actuator
      const status = this.deviceStateTexts.get(d.id)
      if (d.kind === 'pushbutton') {
        const held = !!state.held
        g.circle(x, y, r)
          .fill(held ? 0x56636e : 0x7d8a95)
          .stroke({ width: 3, color: 0x2b333a })
        g.circle(x, y, r - (held ? 8 : 5)).fill(held ? 0x8d9aa5 : 0xb3bec8)
        if (status) status.text = `momentary ${d.contact ?? 'NO'}\n${held ? 'HELD' : 'released'}`
      } else if (d.kind === 'selector') {
        const on = (state.position ?? 0) >= 1
        const angle = on ? Math.PI / 4 : -Math.PI / 4
        g.circle(x, y, r).fill(0x2f373e)
        const dx = Math.sin(angle) * (r - 4)
        const dy = -Math.cos(angle) * (r - 4)
        g.moveTo(x - dx, y - dy)
          .lineTo(x + dx, y + dy)
          .stroke({ width: 12, color: 0xdfe4e8, cap: 'round' })
        if (status) status.text = `maintained ${d.contact ?? 'NO'}\nposition ${on ? '1' : '0'}`
      } else {
        const pos = Math.max(0, Math.min(1, state.position ?? 0))
        const angle = -0.75 * Math.PI + pos * 1.5 * Math.PI
        g.circle(x, y, r).fill(0x2f373e)
        g.moveTo(x, y)
          .lineTo(x + Math.sin(angle) * (r - 4), y - Math.cos(angle) * (r - 4))
          .stroke({ width: 5, color: C.highlight, cap: 'round' })
        if (status) status.text = `potentiometer\n${Math.round(pos * 100)} %`
      }
    }
  }

  private drawPower(view: PanelView) {
    const h = this.layout.disconnect.handle
    this.disconnectHandle.position.set(h.x + h.w / 2, h.y + h.h / 2)
    // Handle upright is ON (I), turned a quarter left is OFF (O).
    this.disconnectHandle.rotation = view.power.on ? 0 : -Math.PI / 2
    this.disconnectArm
      .clear()
      .roundRect(-12, -h.w / 2 + 6, 24, h.w - 12, 8)
      .fill(view.power.on ? 0xc62828 : 0x9e9e9e)
      .stroke({ width: 2, color: 0x111111 })
    this.disconnectText.text = view.power.on ? 'I  ON' : 'O  OFF'

    this.drawLocks(view.power)
  }

  /**
   * Each lock on the lock point with its tag hanging below (the story's supervisor's on the left, the
   * apprentice's own on the right): a danger tag saying who applied it and when.
   */
  private drawLocks(power: PanelView['power']) {
    const l = this.layout.disconnect
    const g = this.lock.clear()
    const locks = [
      power.supervisorLock && {
        colour: C.supervisorLock,
        lines: lockTagLines(power.supervisorLock.name, 'supervisor'),
      },
      power.locked && { colour: C.lockout, lines: lockTagLines(power.tag?.name ?? null, power.tag?.date) },
    ]
    const tagW = (l.rect.w - 24) / 2
    locks.forEach((lock, i) => {
      const tagText = this.tagTexts[i]
      tagText.text = ''
      if (!lock) return
      const cx = l.lock.x + l.lock.w / 2 + (i === 0 ? -13 : 13)
      g.roundRect(cx - 10, l.lock.y + 18, 20, 20, 3).fill(lock.colour)
      g.moveTo(cx - 7, l.lock.y + 18)
        .arc(cx, l.lock.y + 18, 7, Math.PI, 0)
        .stroke({ width: 4, color: 0x555555 })
      // The tag: a red danger band over a white card, tied to the lock.
      const tx = l.rect.x + 8 + i * (tagW + 8)
      const ty = l.lock.y + l.lock.h + 2
      g.moveTo(cx, l.lock.y + 38)
        .lineTo(tx + tagW / 2, ty)
        .stroke({ width: 1, color: 0x333333 })
      g.rect(tx, ty, tagW, 40).fill(0xffffff).stroke({ width: 1, color: 0x333333 })
      g.rect(tx, ty, tagW, 11).fill(C.lampFault)
      tagText.text = lock.lines.join('\n')
      tagText.position.set(tx + tagW / 2, ty + 1)
    })
  }

  private drawLamps(view: PanelView) {
    const s = this.layout.drive.statusLamp
    this.lamp.clear().circle(s.x, s.y, 9).fill(LAMP[view.lamp]).stroke({ width: 2, color: 0x000000 })
    this.chargeLamp
      .clear()
      .circle(610, 268, 8)
      .fill(view.chargeLamp ? C.lampCharging : C.lampOff)
      .stroke({ width: 2, color: 0x000000 })
  }

  private drawHighlight(point: PointId | null, armed: PointId | null) {
    const g = this.highlight.clear()
    const t = point ? this.layout.terminals[point] : undefined
    if (t) g.circle(t.x, t.y, TERMINAL_RADIUS + 5).stroke({ width: 3, color: C.highlight })
    // The first terminal of a tap-tap wire, waiting for its second: a double ring.
    const a = armed ? this.layout.terminals[armed] : undefined
    if (a) {
      g.circle(a.x, a.y, TERMINAL_RADIUS + 5).stroke({ width: 3, color: C.selected })
      g.circle(a.x, a.y, TERMINAL_RADIUS + 10).stroke({ width: 2, color: C.selected, alpha: 0.6 })
    }
  }

  /** Text is drawn into textures; zoomed in, they need more pixels to stay sharp. */
  setTextResolution(resolution: number) {
    const visit = (node: Container) => {
      for (const child of node.children) {
        if (child instanceof Text) child.resolution = resolution
        else if (child instanceof Container) visit(child)
      }
    }
    this.textResolution = resolution
    visit(this.root)
    // Redrawing the still parts every frame costs a software renderer most of its time.
    if (resolution <= MAX_CACHE_RESOLUTION) {
      this.staticLayer.cacheAsTexture({ resolution, antialias: true })
      this.staticLayer.updateCacheTexture()
    } else {
      this.staticLayer.cacheAsTexture(false)
    }
  }

  private drawProbes(view: PanelView) {
    const g = this.probes.clear()
    for (const probe of ['red', 'black'] as const) {
      const tip =
        view.probeDrag?.probe === probe ? view.probeDrag.at : probeTip(this.layout, probe, view.probes[probe])
      const colour = probe === 'red' ? C.probeRed : C.probeBlack
      const [first, ...rest] = probeLead(this.layout, probe, tip)
      g.moveTo(first.x, first.y)
      for (const p of rest) g.lineTo(p.x, p.y)
      g.stroke({ width: 2, color: colour, alpha: 0.8, join: 'round' })
      g.roundRect(tip.x - 5, tip.y - PROBE_BODY, 10, PROBE_BODY - 4, 3).fill(colour)
      g.moveTo(tip.x, tip.y - 4)
        .lineTo(tip.x, tip.y)
        .stroke({ width: 2, color: 0x999999 })
    }
  }
}

function shortName(label: string): string {
  return label.length > 12 ? `${label.slice(0, 11)}…` : label
}
