// What lies under a scene point. Pure geometry, so pointer handling can be tested without a canvas.
import { TERMINAL_RADIUS } from './layout'
import type { KeypadKey, MeterMode, PanelLayout, PointId, ProbeColour, Rect, Vec } from './types'
import { distanceToCubic, wireCurve } from './wireCurve'

export type Hit =
  | { kind: 'key'; key: KeypadKey }
  | { kind: 'device'; device: string }
  | { kind: 'disconnect' }
  | { kind: 'lock' }
  | { kind: 'meterMode'; mode: MeterMode }
  | { kind: 'probe'; probe: ProbeColour }
  | { kind: 'terminal'; point: PointId }
  | { kind: 'wire'; wire: string }

export interface HitWire {
  id: string
  from: PointId
  to: PointId
}

export interface HitContext {
  wires: readonly HitWire[]
  probes: { red: PointId | null; black: PointId | null }
}

const WIRE_PICK_DISTANCE = 6

export function inRect(r: Rect, p: Vec): boolean {
  return p.x >= r.x && p.x <= r.x + r.w && p.y >= r.y && p.y <= r.y + r.h
}

/** Where a probe's tip is drawn: on its point, or resting in its holster on the meter. */
export function probeTip(layout: PanelLayout, probe: ProbeColour, at: PointId | null): Vec {
  const spot = at ? layout.terminals[at] : undefined
  if (!spot) return layout.meter.holsters[probe]
  // Red sits a little left of the screw and black a little right, so both can share one point.
  return { x: spot.x + (probe === 'red' ? -5 : 5), y: spot.y - 4 }
}

export function hitTest(layout: PanelLayout, ctx: HitContext, p: Vec): Hit | null {
  for (const k of layout.drive.keys) if (inRect(k.rect, p)) return { kind: 'key', key: k.key }
  for (const d of layout.devices) {
    if (Math.hypot(p.x - d.actuator.x, p.y - d.actuator.y) <= d.actuator.r + 4) {
      return { kind: 'device', device: d.id }
    }
  }
  if (inRect(layout.disconnect.handle, p)) return { kind: 'disconnect' }
  if (inRect(layout.disconnect.lock, p)) return { kind: 'lock' }
  for (const s of layout.meter.selector) if (inRect(s.rect, p)) return { kind: 'meterMode', mode: s.mode }

  // Probes before terminals: a placed probe covers its screw, and grabbing it moves it.
  for (const probe of ['red', 'black'] as const) {
    const tip = probeTip(layout, probe, ctx.probes[probe])
    if (Math.hypot(p.x - tip.x, p.y - (tip.y - 10)) <= 12) return { kind: 'probe', probe }
  }

  let nearest: { id: PointId; d: number } | null = null
  for (const t of Object.values(layout.terminals)) {
    const d = Math.hypot(p.x - t.x, p.y - t.y)
    if (d <= TERMINAL_RADIUS + 4 && (!nearest || d < nearest.d)) nearest = { id: t.id, d }
  }
  if (nearest) return { kind: 'terminal', point: nearest.id }

  let bestWire: { id: string; d: number } | null = null
  ctx.wires.forEach((w, lane) => {
    const a = layout.terminals[w.from]
    const b = layout.terminals[w.to]
    if (!a || !b) return
    const d = distanceToCubic(wireCurve(a, b, lane), p)
    if (d <= WIRE_PICK_DISTANCE && (!bestWire || d < bestWire.d)) bestWire = { id: w.id, d }
  })
  if (bestWire) return { kind: 'wire', wire: (bestWire as { id: string }).id }
  return null
}
