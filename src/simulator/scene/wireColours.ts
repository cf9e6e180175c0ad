// How each wire colour of the model is drawn and labelled. Codes are the IEC 60757 colour codes,
// printed on every wire's marker so colour is never the only signal.
import { WIRE_COLOURS as MODEL_COLOURS, type WireColour as ModelColour } from '@shared/model/setup'
import { wireColourMarking, wireMarkerText } from '@shared/schematic/markings'

export interface WireColour {
  id: ModelColour
  code: string
  name: string
  hex: number
  /** Why a wireman would pick it; shown as help in the colour chooser. */
  use: string
}

// The panel's own fill for each colour and why a wireman would pick it; the code and name printed on
// the marker come from the one marking table (shared/schematic/markings.ts).
// Uses: IEC 60204-1 recommended colours (clause numbers partly from memory) and NFPA 79 13.2.
const STYLE: Record<ModelColour, Pick<WireColour, 'hex' | 'use'>> = {
  blue: { hex: 0x1f5fbf, use: 'DC control (recommended)' },
  whiteBlue: { hex: 0xc9d8f2, use: 'Grounded DC control (NFPA 79)' },
  black: { hex: 0x222222, use: 'AC or DC power' },
  red: { hex: 0xc62828, use: 'AC control' },
  orange: { hex: 0xef7d00, use: 'Stays live with the main switch off' },
  brown: { hex: 0x6d4c41, use: 'General purpose' },
  grey: { hex: 0x8a8f96, use: 'General purpose' },
  white: { hex: 0xf4f4f4, use: 'General purpose' },
  violet: { hex: 0x7b1fa2, use: 'General purpose' },
  greenYellow: { hex: 0x7cb342, use: 'Protective earth only — never control' },
}

function styled(id: ModelColour): WireColour {
  const { code, name } = wireColourMarking(id)
  return { id, code, name, ...STYLE[id] }
}

export const WIRE_COLOURS: readonly WireColour[] = MODEL_COLOURS.map(styled)

export const DEFAULT_WIRE_COLOUR: ModelColour = 'blue'

export function isWireColour(id: string): id is ModelColour {
  return (MODEL_COLOURS as readonly string[]).includes(id)
}

/** Unknown colours still draw, in grey, with a short code made from their name. */
export function wireColour(id: string): WireColour {
  if (isWireColour(id)) return styled(id)
  const { code, name } = wireColourMarking(id)
  return { id: 'grey', code, name, hex: STYLE.grey.hex, use: '' }
}

/** The label printed on a wire marker sleeve, e.g. "W3 BU": as the schematic draws it and the grader names it. */
export function wireLabel(wireId: string, colourId: string, index: number): string {
  return wireMarkerText(wireId, colourId, index)
}
