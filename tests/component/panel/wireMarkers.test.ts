// The schematic (shared/schematic) prints the same wire markers as the panel: a drawing and the bench
// must never disagree about a wire's number or colour code.
import { describe, expect, it } from 'vitest'
import { WIRE_COLOURS } from '@shared/model/setup'
import { wireMarkerText } from '@shared/schematic'
import { wireLabel } from '@/panel/wireColours'

describe('wire markers', () => {
  it.each(WIRE_COLOURS)('match the panel for %s wires', (colour) => {
    for (const [id, index] of [
      ['w1', 0],
      ['w12', 3],
      ['wRunFeed', 2],
      ['feed7', 9],
    ] as const) {
      expect(wireMarkerText(id, colour, index)).toBe(wireLabel(id, colour, index))
    }
  })
})
