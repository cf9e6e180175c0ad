// The schematic measures text with a table of the font's advance widths; the table must be the one the
// shipped TTF files give (regenerate with server/records/scripts/generate-font-metrics.ts).
import { describe, expect, it } from 'vitest'
import { FONT_METRICS } from '@shared/schematic/fontMetrics'
import { fontMetricsSource } from '../../../server/records/fontMetrics'

describe('font metrics table', () => {
  it('matches the shipped Atkinson Hyperlegible files', () => {
    const fresh = fontMetricsSource()
    expect(fresh).toContain(`regular: '${FONT_METRICS.regular}'`)
    expect(fresh).toContain(`bold: '${FONT_METRICS.bold}'`)
    expect(FONT_METRICS.regular.split(' ')).toHaveLength([...FONT_METRICS.characters].length)
  })
})
