// The palette's text/background pairs meet WCAG 2.1 contrast (SC 1.4.3, AA: 4.5:1 for normal text).
import { describe, expect, it } from 'vitest'
import { slipwayDark, slipwayLight } from '@/plugins/theme'

// Relative luminance and contrast ratio as defined in WCAG 2.1 (definitions "relative luminance", "contrast ratio").
function luminance(hex: string): number {
  const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255)
  const lin = (c: number) => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4)
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b)
}
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x)
  return (hi + 0.05) / (lo + 0.05)
}

describe('contrast of the Slipway themes', () => {
  it('computes the reference ratios of WCAG 2.1 (black on white 21:1, #767676 on white ≈ 4.54:1)', () => {
    // 21:1 is the maximum given by the WCAG definition; #767676 on white is the commonly quoted
    // lightest grey passing AA (common practice; value from memory, 4.54:1).
    expect(contrast('#000000', '#ffffff')).toBeCloseTo(21, 5)
    expect(contrast('#767676', '#ffffff')).toBeCloseTo(4.54, 2)
  })

  for (const [name, theme] of [
    ['light', slipwayLight],
    ['dark', slipwayDark],
  ] as const) {
    const c = theme.colors as Record<string, string>
    const pairs: [string, string][] = [
      ['on-background', 'background'],
      ['on-surface', 'surface'],
      ['muted', 'surface'],
      ['muted', 'background'],
      ['primary', 'surface'],
      ['primary', 'background'],
      ['on-surface-variant', 'surface-variant'],
      // status colours are also used as text (tonal alerts, “Remove” buttons)
      ['error', 'surface'],
      ['success', 'surface'],
      ['warning', 'surface'],
      ['info', 'surface'],
      ...(['primary', 'secondary', 'error', 'success', 'warning', 'info'].map((k) => [`on-${k}`, k]) as [
        string,
        string,
      ][]),
    ]
    it.each(pairs)(`${name}: %s on %s reaches 4.5:1`, (fg, bg) => {
      expect(contrast(c[fg], c[bg])).toBeGreaterThanOrEqual(4.5)
    })
  }
})
