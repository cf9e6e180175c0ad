// The commissioning trend as a small vector chart (SVG string): speed reference and output frequency
// over the attempt's simulated time, Hz on the left, the shaft speed they mean in rpm on the right.
import { escapeXml, FONT_FAMILY } from '@shared/schematic'
import { formatAttemptTime } from './format'
import type { CommissioningTrend } from './types'

export const TREND_WIDTH = 700
export const TREND_HEIGHT = 260
const PLOT = { left: 52, right: TREND_WIDTH - 60, top: 36, bottom: TREND_HEIGHT - 40 }
const OUTPUT_COLOUR = '#1f4fa0'
const REFERENCE_COLOUR = '#b35c00'

/** A round step giving about `count` intervals over `span`: 1, 2 or 5 times a power of ten. */
export function niceStep(span: number, count: number): number {
  const raw = span / Math.max(1, count)
  const power = 10 ** Math.floor(Math.log10(raw))
  const fraction = raw / power
  return (fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10) * power
}

function r(value: number): string {
  return String(Math.round(value * 10) / 10)
}

function text(
  x: number,
  y: number,
  body: string,
  anchor: 'start' | 'middle' | 'end' = 'start',
  extra = '',
): string {
  return `<text x="${r(x)}" y="${r(y)}" font-size="11" text-anchor="${anchor}" fill="#222222"${extra}>${escapeXml(body)}</text>`
}

export function trendChartSvg(trend: CommissioningTrend): string {
  const endMs = Math.max(trend.endMs, 1000)
  const top = Math.max(1, ...trend.points.flatMap((p) => [p.outputHz, p.referenceHz ?? 0]))
  const hzStep = niceStep(top, 5)
  const hzMax = Math.ceil((top * 1.05) / hzStep) * hzStep
  const secondsStep = niceStep(endMs / 1000, 8)
  const x = (ms: number) => PLOT.left + ((PLOT.right - PLOT.left) * ms) / endMs
  const y = (hz: number) => PLOT.bottom - ((PLOT.bottom - PLOT.top) * hz) / hzMax
  const out: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" width="${TREND_WIDTH}" height="${TREND_HEIGHT}" viewBox="0 0 ${TREND_WIDTH} ${TREND_HEIGHT}" font-family="${FONT_FAMILY}, sans-serif" role="img" aria-label="Speed reference and output frequency over the attempt">`,
    `<rect x="0" y="0" width="${TREND_WIDTH}" height="${TREND_HEIGHT}" fill="#ffffff"/>`,
  ]
  for (let hz = 0; hz <= hzMax + 1e-9; hz += hzStep) {
    out.push(
      `<line x1="${PLOT.left}" y1="${r(y(hz))}" x2="${PLOT.right}" y2="${r(y(hz))}" stroke="#d8d8d8" stroke-width="1"/>`,
      text(PLOT.left - 6, y(hz) + 4, r(hz), 'end'),
      text(PLOT.right + 6, y(hz) + 4, String(Math.round(hz * trend.rpmPerHz))),
    )
  }
  for (let s = 0; s * 1000 <= endMs + 1e-6; s += secondsStep) {
    const px = x(s * 1000)
    out.push(
      `<line x1="${r(px)}" y1="${PLOT.top}" x2="${r(px)}" y2="${PLOT.bottom}" stroke="#ececec" stroke-width="1"/>`,
      text(px, PLOT.bottom + 15, formatAttemptTime(s * 1000).replace(/\.\d$/, ''), 'middle'),
    )
  }
  out.push(
    `<rect x="${PLOT.left}" y="${PLOT.top}" width="${PLOT.right - PLOT.left}" height="${PLOT.bottom - PLOT.top}" fill="none" stroke="#555555" stroke-width="1"/>`,
    text(PLOT.left - 6, PLOT.top - 8, 'Hz', 'end'),
    text(PLOT.right + 6, PLOT.top - 8, 'rpm'),
    text((PLOT.left + PLOT.right) / 2, TREND_HEIGHT - 6, 'Time into the attempt (minutes:seconds)', 'middle'),
  )
  // Reference: dashed, broken where the drive's electronics were dark. Output: solid.
  let run: string[] = []
  const flush = () => {
    if (run.length > 1) {
      out.push(
        `<polyline points="${run.join(' ')}" fill="none" stroke="${REFERENCE_COLOUR}" stroke-width="1.8" stroke-dasharray="6 4"/>`,
      )
    }
    run = []
  }
  for (const p of trend.points) {
    if (p.referenceHz === null) flush()
    else run.push(`${r(x(p.tMs))},${r(y(p.referenceHz))}`)
  }
  flush()
  const output = trend.points.map((p) => `${r(x(p.tMs))},${r(y(p.outputHz))}`).join(' ')
  out.push(`<polyline points="${output}" fill="none" stroke="${OUTPUT_COLOUR}" stroke-width="2.2"/>`)
  // Legend above the plot.
  const legendY = 16
  out.push(
    `<line x1="${PLOT.left}" y1="${legendY}" x2="${PLOT.left + 28}" y2="${legendY}" stroke="${OUTPUT_COLOUR}" stroke-width="2.2"/>`,
    text(PLOT.left + 34, legendY + 4, 'Output frequency (motor speed)'),
    `<line x1="${PLOT.left + 240}" y1="${legendY}" x2="${PLOT.left + 268}" y2="${legendY}" stroke="${REFERENCE_COLOUR}" stroke-width="1.8" stroke-dasharray="6 4"/>`,
    text(PLOT.left + 274, legendY + 4, 'Speed reference (while the drive is powered)'),
    '</svg>',
  )
  return out.join('\n')
}
