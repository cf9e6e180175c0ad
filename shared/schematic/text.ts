// Text measurement without a DOM, from the font's own advance widths (fontMetrics.ts), so the layout
// knows how much room every label takes in the browser and in the PDF alike.
import { FONT_METRICS } from './fontMetrics'

export const FONT_FAMILY = 'Atkinson Hyperlegible'
/** Ascender and descender of the font, in ems (its hhea table: 950 and 290 per 1000). */
export const ASCENT = 0.95
export const DESCENT = 0.29

function table(widths: string): { byChar: Map<string, number>; widest: number } {
  const values = widths.split(' ').map(Number)
  const byChar = new Map([...FONT_METRICS.characters].map((ch, i) => [ch, values[i]]))
  return { byChar, widest: Math.max(...values) }
}

const REGULAR = table(FONT_METRICS.regular)
const BOLD = table(FONT_METRICS.bold)

/** Width in px of `text` at `size` px. A character the table lacks counts as the widest one. */
export function textWidth(text: string, size: number, bold = false): number {
  const { byChar, widest } = bold ? BOLD : REGULAR
  let units = 0
  for (const ch of text) units += byChar.get(ch) ?? widest
  return (units * size) / 1000
}

/** Greedy line breaking at spaces; a word longer than a line is cut. */
export function wrapText(text: string, maxWidth: number, size: number, bold = false): string[] {
  const lines: string[] = []
  let line = ''
  for (const word of text.split(/\s+/).filter(Boolean)) {
    const candidate = line ? `${line} ${word}` : word
    if (textWidth(candidate, size, bold) <= maxWidth) {
      line = candidate
      continue
    }
    if (line) lines.push(line)
    line = ''
    let rest = word
    while (textWidth(rest, size, bold) > maxWidth) {
      let cut = rest.length - 1
      while (cut > 1 && textWidth(rest.slice(0, cut), size, bold) > maxWidth) cut--
      lines.push(rest.slice(0, cut))
      rest = rest.slice(cut)
    }
    line = rest
  }
  if (line) lines.push(line)
  return lines.length > 0 ? lines : ['']
}
