// How each wire colour of the model is drawn and labelled. Codes are the IEC 60757 colour codes,
// printed on every wire's marker so colour is never the only signal.
import { WIRE_COLOURS as MODEL_COLOURS, type WireColour as ModelColour } from '@shared/model/setup'

export interface WireColour {
  id: ModelColour
  code: string
  name: string
  hex: number
  /** Why a wireman would pick it; shown as help in the colour chooser. */
  use: string
}

// Uses: IEC 60204-1 recommended colours (clause numbers partly from memory) and NFPA 79 13.2.
const STYLE: Record<ModelColour, Omit<WireColour, 'id'>> = {
  blue: { code: 'BU', name: 'Blue', hex: 0x1f5fbf, use: 'DC control (recommended)' },
  whiteBlue: { code: 'WHBU', name: 'White/blue', hex: 0xc9d8f2, use: 'Grounded DC control (NFPA 79)' },
  black: { code: 'BK', name: 'Black', hex: 0x222222, use: 'AC or DC power' },
  red: { code: 'RD', name: 'Red', hex: 0xc62828, use: 'AC control' },
  orange: { code: 'OG', name: 'Orange', hex: 0xef7d00, use: 'Stays live with the main switch off' },
  brown: { code: 'BN', name: 'Brown', hex: 0x6d4c41, use: 'General purpose' },
  grey: { code: 'GY', name: 'Grey', hex: 0x8a8f96, use: 'General purpose' },
  white: { code: 'WH', name: 'White', hex: 0xf4f4f4, use: 'General purpose' },
  violet: { code: 'VT', name: 'Violet', hex: 0x7b1fa2, use: 'General purpose' },
  greenYellow: {
    code: 'GNYE',
    name: 'Green/yellow',
    hex: 0x7cb342,
    use: 'Protective earth only — never control',
  },
}

export const WIRE_COLOURS: readonly WireColour[] = MODEL_COLOURS.map((id) => ({ id, ...STYLE[id] }))

export const DEFAULT_WIRE_COLOUR: ModelColour = 'blue'

export function isWireColour(id: string): id is ModelColour {
  return (MODEL_COLOURS as readonly string[]).includes(id)
}

/** Unknown colours still draw, in grey, with their name as the label. */
export function wireColour(id: string): WireColour {
  if (isWireColour(id)) return { id, ...STYLE[id] }
  return { id: 'grey', code: id.slice(0, 4).toUpperCase(), name: id, hex: 0x8a8f96, use: '' }
}

/** The label printed on a wire marker sleeve, e.g. "W3 BU". */
export function wireLabel(wireId: string, colourId: string, index: number): string {
  const digits = /(\d+)$/.exec(wireId)?.[1] ?? String(index + 1)
  return `W${digits} ${wireColour(colourId).code}`
}
