// Where the meter's leads run: from the jacks under the meter to the top of each probe. A probe on the
// drive's power terminals (above its display) gets a lead that climbs the gap between the meter and the
// drive and comes in over the top, so a lead never crosses the drive's display or keypad.
import type { PanelLayout, ProbeColour, Vec } from './types'
import { pointOnCubic } from './wireCurve'

/** The probe body is drawn this far above its tip. */
export const PROBE_BODY = 24

export function jackPoint(layout: PanelLayout, probe: ProbeColour): Vec {
  const m = layout.meter.rect
  return { x: m.x + (probe === 'red' ? 60 : 130), y: m.y + m.h }
}

/** The lead as a polyline, from the jack to the top of the probe whose tip is at `tip`. */
export function probeLead(layout: PanelLayout, probe: ProbeColour, tip: Vec): Vec[] {
  const jack = jackPoint(layout, probe)
  const top = { x: tip.x, y: tip.y - PROBE_BODY + 2 }
  if (tip.y >= layout.drive.controlStrip.y) {
    // Below the drive's upper half: hang down from the jack and come up from underneath.
    const c = {
      p0: jack,
      p1: { x: jack.x, y: jack.y + 30 },
      p2: { x: top.x, y: Math.max(top.y, jack.y) + 40 },
      p3: top,
    }
    return Array.from({ length: 25 }, (_, i) => pointOnCubic(c, i / 24))
  }
  const lane = probe === 'red' ? 0 : 6
  const gutter = layout.drive.rect.x - 6 - lane
  const over = layout.drive.rect.y - 6 - lane
  const under = jack.y + 12 + lane
  return [
    jack,
    { x: jack.x, y: under },
    { x: gutter, y: under },
    { x: gutter, y: over },
    { x: top.x, y: over },
    top,
  ]
}
