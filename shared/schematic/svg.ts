// The layout as one SVG document (a string: no DOM), drawn with attributes only (no CSS), so browsers
// and the PDF's SVG reader draw it alike.
import { deviceSymbol, n } from './symbols'
import { FONT_FAMILY } from './text'
import type { PlacedText, PlacedWire, Point, SchematicLayout } from './types'

export function escapeXml(text: string): string {
  return text.replace(
    /[&<>"']/g,
    (c) => `&${{ '&': 'amp', '<': 'lt', '>': 'gt', '"': 'quot', "'": 'apos' }[c]};`,
  )
}

function points(path: readonly Point[]): string {
  return path.map((p) => `${n(p.x)},${n(p.y)}`).join(' ')
}

function wire(w: PlacedWire): string {
  const pts = points(w.path)
  const common = `points="${pts}" fill="none" stroke-linejoin="round" stroke-linecap="round"`
  // A dark edge keeps white and yellow conductors visible on white paper.
  const parts = [
    `<polyline ${common} stroke="#333333" stroke-width="4"/>`,
    `<polyline ${common} stroke="${w.colour.stroke}" stroke-width="2.4"/>`,
  ]
  if (w.colour.stripe) {
    parts.push(`<polyline ${common} stroke="${w.colour.stripe}" stroke-width="2.4" stroke-dasharray="5 5"/>`)
  }
  return parts.join('')
}

function text(t: PlacedText): string {
  const weight = t.bold ? ' font-weight="bold"' : ''
  const anchor = t.anchor === 'start' ? '' : ` text-anchor="${t.anchor}"`
  return `<text x="${n(t.x)}" y="${n(t.y)}" font-size="${t.size}"${weight}${anchor} fill="#111111">${escapeXml(t.text)}</text>`
}

export interface SvgOptions {
  /** Accessible title of the drawing. */
  title?: string
}

export function schematicSvg(layout: SchematicLayout, options: SvgOptions = {}): string {
  const title = options.title ?? 'Control circuit as wired'
  const summary = `${layout.wires.length} ${layout.wires.length === 1 ? 'wire' : 'wires'}, ${layout.devices.length} ${
    layout.devices.length === 1 ? 'field device' : 'field devices'
  }.`
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${layout.width}" height="${layout.height}" viewBox="0 0 ${layout.width} ${layout.height}" role="img" aria-label="${escapeXml(`${title}: ${summary}`)}" font-family="${FONT_FAMILY}, sans-serif">`,
    `<title>${escapeXml(title)}</title>`,
    `<desc>${escapeXml(summary)}</desc>`,
    `<rect x="0" y="0" width="${layout.width}" height="${layout.height}" fill="#ffffff"/>`,
  ]
  for (const s of layout.strips) {
    const f = s.frame
    out.push(
      `<rect x="${n(f.x)}" y="${n(f.y)}" width="${n(f.w)}" height="${n(f.h)}" fill="#f7f7f5" stroke="#666666" stroke-width="1" stroke-dasharray="6 3"/>`,
    )
  }
  for (const link of layout.internalLinks) {
    out.push(
      `<polyline points="${points(link)}" fill="none" stroke="#444444" stroke-width="1.4" stroke-dasharray="4 3"/>`,
    )
  }
  for (const w of layout.wires) out.push(wire(w))
  for (const t of layout.terminals) {
    const b = t.box
    out.push(
      `<rect x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" rx="2" fill="#ffffff" stroke="#222222" stroke-width="1.4"/>`,
    )
  }
  for (const bar of layout.bars) {
    out.push(
      `<line x1="${n(bar.from.x)}" y1="${n(bar.from.y)}" x2="${n(bar.to.x)}" y2="${n(bar.to.y)}" stroke="#222222" stroke-width="2.2" stroke-linecap="round"/>`,
    )
    for (const j of bar.junctions) out.push(`<circle cx="${n(j.x)}" cy="${n(j.y)}" r="2.8" fill="#222222"/>`)
  }
  for (const d of layout.devices) out.push(deviceSymbol(d))
  for (const w of layout.wires) {
    const b = w.markerBox
    out.push(
      `<rect x="${n(b.x)}" y="${n(b.y)}" width="${n(b.w)}" height="${n(b.h)}" rx="3" fill="#ffffff" stroke="#333333" stroke-width="1"/>`,
    )
  }
  for (const t of layout.texts) out.push(text(t))
  out.push('</svg>')
  return out.join('\n')
}
