// Device symbols as SVG. Contacts follow the shapes of IEC 60617: make contact (S00227) and break
// contact (S00229) drawn vertically, with a dashed mechanical link to a push-operated or turn-operated
// actuator (S00171, S00172), and the potentiometer as a resistor with a sliding contact (S00557 with
// an arrow). Drawn from memory of the published shapes, in our own proportions. The loose end (an open
// ring) and the box for any other device are our own.
import { WIPER_DX } from './layout/model'
import type { PlacedDevice } from './types'

const STROKE = '#222222'

function line(x1: number, y1: number, x2: number, y2: number, extra = ''): string {
  return `<line x1="${n(x1)}" y1="${n(y1)}" x2="${n(x2)}" y2="${n(y2)}" stroke="${STROKE}" stroke-width="1.6"${extra}/>`
}

export function n(value: number): string {
  return String(Math.round(value * 100) / 100)
}

function contact(d: PlacedDevice): string[] {
  const x = d.axisX
  const m = (d.top + d.bottom) / 2
  const parts = [line(x, d.top, x, m - 12), line(x, m + 12, x, d.bottom)]
  if (d.contact === 'NC') {
    parts.push(line(x, m - 12, x - 13, m - 12), line(x, m + 12, x - 15, m - 15))
  } else {
    parts.push(line(x, m + 12, x - 11, m - 13))
  }
  // Mechanical link from the blade to the actuator on the left.
  const ax = x - 28
  parts.push(line(x - 6, m, ax, m, ' stroke-dasharray="3 2"'))
  if (d.symbol === 'pushbutton') {
    parts.push(line(ax, m - 7, ax, m + 7), line(ax, m - 7, ax - 4, m - 7), line(ax, m + 7, ax - 4, m + 7))
  } else {
    parts.push(line(ax, m - 7, ax, m + 7), line(ax, m - 7, ax - 5, m - 7), line(ax, m + 7, ax + 5, m + 7))
  }
  return parts
}

function potentiometer(d: PlacedDevice): string[] {
  const x = d.axisX
  const m = (d.top + d.bottom) / 2
  // The wiper comes in from the side its wire leaves towards (layout/index.ts orientWipers).
  const w = d.terminals.find((t) => t.role === 'wiper')?.at.x ?? x + WIPER_DX
  const s = w < x ? -1 : 1
  return [
    line(x, d.top, x, m - 16),
    line(x, m + 16, x, d.bottom),
    `<rect x="${n(x - 6)}" y="${n(m - 16)}" width="12" height="32" fill="#ffffff" stroke="${STROKE}" stroke-width="1.6"/>`,
    line(w, m, x + s * 11, m),
    `<polygon points="${n(x + s * 7)},${n(m)} ${n(x + s * 13)},${n(m - 3.5)} ${n(x + s * 13)},${n(m + 3.5)}" fill="${STROKE}"/>`,
    line(w, m, w, d.bottom),
  ]
}

function looseEnd(d: PlacedDevice): string[] {
  const t = d.terminals[0].at
  const inward = t.y === d.top ? 1 : -1
  const ring = t.y + inward * 16
  return [
    line(t.x, t.y, t.x, ring - inward * 4),
    `<circle cx="${n(t.x)}" cy="${n(ring)}" r="4" fill="#ffffff" stroke="${STROKE}" stroke-width="1.6"/>`,
  ]
}

function otherDevice(d: PlacedDevice): string[] {
  const x = d.axisX
  const m = (d.top + d.bottom) / 2
  const parts = [
    `<rect x="${n(x - 12)}" y="${n(m - 16)}" width="24" height="32" fill="#ffffff" stroke="${STROKE}" stroke-width="1.6"/>`,
  ]
  for (const t of d.terminals) parts.push(line(t.at.x, t.at.y, t.at.x, t.at.y === d.top ? m - 16 : m + 16))
  return parts
}

export function deviceSymbol(d: PlacedDevice): string {
  const parts =
    d.symbol === 'pushbutton' || d.symbol === 'selector'
      ? contact(d)
      : d.symbol === 'potentiometer'
        ? potentiometer(d)
        : d.symbol === 'looseEnd'
          ? looseEnd(d)
          : otherDevice(d)
  for (const t of d.terminals) {
    if (d.symbol === 'looseEnd') continue
    parts.push(
      `<circle cx="${n(t.at.x)}" cy="${n(t.at.y)}" r="3.2" fill="#ffffff" stroke="${STROKE}" stroke-width="1.4"/>`,
    )
  }
  return parts.join('')
}
