// Public interface of the schematic renderer (see README.md beside this file).
import { schematicInputFromWiring, type Wiring } from './fromWiring'
import { layoutSchematic } from './layout'
import { schematicSvg, type SvgOptions } from './svg'
import type { SchematicLayout } from './types'

export interface SchematicDrawing {
  svg: string
  layout: SchematicLayout
}

/** Draws a wiring state (the scenario's devices and the current wires) as an SVG control-circuit diagram. */
export function drawSchematic(wiring: Wiring, options: SvgOptions = {}): SchematicDrawing {
  const layout = layoutSchematic(schematicInputFromWiring(wiring))
  return { svg: schematicSvg(layout, options), layout }
}

export { schematicInputFromWiring, wiringOfState, type Wiring } from './fromWiring'
export { layoutSchematic, layoutProblems } from './layout'
export { schematicSvg, escapeXml, type SvgOptions } from './svg'
export {
  wireNumber,
  wireMarkerText,
  wireColourMarking,
  contactMarkings,
  contactWords,
  deviceTerminalLabels,
  POTENTIOMETER_MARKINGS,
  type WireColourMarking,
} from './markings'
export { textWidth, wrapText, FONT_FAMILY } from './text'
export type * from './types'
