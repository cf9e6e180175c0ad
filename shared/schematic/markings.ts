// How wires and device terminals are marked: the one definition of the wire numbers, colour codes and
// terminal markings that the panel prints, the schematic draws and the grader writes (through
// shared/scenario/names.ts), so the drawing, the bench and the evidence read alike.
import type { DeviceKind } from '../model/points'
import type { ContactType } from '../model/setup'

export interface WireColourMarking {
  /** IEC 60757 colour code printed on the wire marker, e.g. "BU". */
  code: string
  /** Plain name, e.g. "Blue". */
  name: string
  /** Stroke colour of the conductor in the drawing. */
  stroke: string
  /** A second colour drawn as a stripe over the first (two-colour insulation). */
  stripe?: string
}

// Codes: IEC 60757, the one table of them (the panel takes its codes and names from here). Strokes are
// the drawing's (the panel keeps its own fills).
const COLOURS: Record<string, WireColourMarking> = {
  blue: { code: 'BU', name: 'Blue', stroke: '#1f5fbf' },
  whiteBlue: { code: 'WHBU', name: 'White/blue', stroke: '#f4f4f4', stripe: '#1f5fbf' },
  black: { code: 'BK', name: 'Black', stroke: '#222222' },
  red: { code: 'RD', name: 'Red', stroke: '#c62828' },
  orange: { code: 'OG', name: 'Orange', stroke: '#ef7d00' },
  brown: { code: 'BN', name: 'Brown', stroke: '#6d4c41' },
  grey: { code: 'GY', name: 'Grey', stroke: '#8a8f96' },
  white: { code: 'WH', name: 'White', stroke: '#f4f4f4' },
  violet: { code: 'VT', name: 'Violet', stroke: '#7b1fa2' },
  greenYellow: { code: 'GNYE', name: 'Green/yellow', stroke: '#2e7d32', stripe: '#f9d71c' },
}

/** Unknown colours still draw, in grey, with a short code made from their name. */
export function wireColourMarking(colour: string): WireColourMarking {
  return (
    COLOURS[colour] ?? {
      code:
        colour
          .replace(/[^A-Za-z]/g, '')
          .slice(0, 4)
          .toUpperCase() || 'GY',
      name: colour,
      stroke: '#8a8f96',
    }
  )
}

/**
 * The wire number printed on the marker, as the panel numbers wires: the digits at the end of the
 * wire's id, else its position in the wiring (1-based). The panel creates ids "w1", "w2", ….
 */
export function wireNumber(wireId: string, index: number): string {
  const digits = /(\d+)$/.exec(wireId)?.[1] ?? String(index + 1)
  return `W${digits}`
}

/** The whole marker text, e.g. "W3 BU". */
export function wireMarkerText(wireId: string, colour: string, index: number): string {
  return `${wireNumber(wireId, index)} ${wireColourMarking(colour).code}`
}

/**
 * Terminal markings of a field device. Contact blocks follow IEC 60947-5-1 (a normally open block is
 * 13–14, a normally closed block 11–12); the potentiometer's ends and wiper are our own H, W, L.
 */
export function contactMarkings(contact: ContactType): { a: string; b: string } {
  return contact === 'NC' ? { a: '11', b: '12' } : { a: '13', b: '14' }
}

export const POTENTIOMETER_MARKINGS = { hi: 'H', wiper: 'W', lo: 'L' } as const

/** A field device's terminal markings by terminal name: a contact block's (as `contact`), a potentiometer's. */
export function deviceTerminalLabels(
  kind: DeviceKind,
  contact: ContactType | undefined,
): Record<string, string> {
  return kind === 'potentiometer' ? { ...POTENTIOMETER_MARKINGS } : contactMarkings(contact ?? 'NO')
}

/** A contact type in words, as printed on the block's label. */
export function contactWords(contact: ContactType): string {
  return contact === 'NC' ? 'normally closed' : 'normally open'
}
