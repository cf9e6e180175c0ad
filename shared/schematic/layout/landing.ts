// How wires land on a terminal. Several wires on one terminal land side by side: on a short bar through
// a device's terminal, or along a drive terminal's box made wide enough. Where that bar or box would
// reach a neighbouring terminal (and seem to join it), or where one side has two terminals (a
// potentiometer's low end and wiper), each wire slants in to its terminal point instead.
import { terminalBoxWidth } from './metrics'
import type { Model, RowObject, Side } from './model'
import type { Pin, Routing } from './route'

/** Room between a landing wire and the end of its bar or box. */
export const LANDING_PAD = 10
const CLEARANCE = 6

export interface Landings {
  /** Pins of each object side. */
  pins: Map<RowObject, Map<Side, Pin[]>>
  /** The wire lands straight down on a bar or box edge (else it slants to the terminal point). */
  straight: (pin: Pin) => boolean
  /** A drive terminal's box, horizontally (raw coordinates). */
  terminalSpan: (object: RowObject) => [number, number]
}

type Span = [number, number]

function overlaps(a: Span, b: Span): boolean {
  return a[0] < b[1] + CLEARANCE && b[0] < a[1] + CLEARANCE
}

export function chooseLandings(model: Model, routing: Routing): Landings {
  const pins = new Map<RowObject, Map<Side, Pin[]>>()
  for (const s of routing.segments) {
    for (const pin of [s.a, s.b]) {
      if (pin.node.object.kind === 'feedthrough') continue
      const bySide = pins.get(pin.node.object) ?? new Map<Side, Pin[]>()
      bySide.set(pin.side, [...(bySide.get(pin.side) ?? []), pin])
      pins.set(pin.node.object, bySide)
    }
  }

  // The least each object covers (a terminal's labelled box, a device terminal's point), and what a
  // bar or widened box would cover.
  const bare = new Map<RowObject, Span>()
  const wide = new Map<string, { object: RowObject; side: Side | 'both'; span: Span }>()
  for (const row of model.rows) {
    for (const object of row.objects) {
      if (object.kind === 'feedthrough') continue
      const bySide = pins.get(object) ?? new Map<Side, Pin[]>()
      if (object.kind === 'terminal') {
        const half = terminalBoxWidth(object.terminal?.label ?? '') / 2
        const span: Span = [object.x - half, object.x + half]
        bare.set(object, span)
        const xs = [...bySide.values()].flat().map((p) => p.x)
        if (xs.length > 0) {
          wide.set(`t${wide.size}`, {
            object,
            side: 'both',
            span: [
              Math.min(span[0], ...xs.map((x) => x - LANDING_PAD)),
              Math.max(span[1], ...xs.map((x) => x + LANDING_PAD)),
            ],
          })
        }
      } else {
        bare.set(object, [object.x - 4, object.x + 4])
        for (const [side, list] of bySide) {
          if (!list.every((p) => p.node.anchor.dx === list[0].node.anchor.dx)) continue
          const anchorX = object.x + list[0].node.anchor.dx
          const xs = list.map((p) => p.x)
          wide.set(`d${wide.size}`, {
            object,
            side,
            span: [Math.min(anchorX, ...xs), Math.max(anchorX, ...xs)],
          })
        }
      }
    }
  }

  const accepted = new Set<string>()
  for (const [key, candidate] of wide) {
    const row = model.rows[candidate.object.row].objects
    const clash =
      row.some(
        (o) => o !== candidate.object && bare.has(o) && overlaps(candidate.span, bare.get(o) as Span),
      ) ||
      [...wide].some(
        ([otherKey, other]) =>
          otherKey !== key &&
          other.object !== candidate.object &&
          other.object.row === candidate.object.row &&
          (other.side === 'both' || candidate.side === 'both' || other.side === candidate.side) &&
          overlaps(candidate.span, other.span),
      )
    if (!clash) accepted.add(key)
  }
  const acceptedFor = (object: RowObject, side: Side) =>
    [...wide].find(
      ([key, w]) => accepted.has(key) && w.object === object && (w.side === side || w.side === 'both'),
    )

  return {
    pins,
    straight: (pin) => acceptedFor(pin.node.object, pin.side) !== undefined,
    terminalSpan: (object) => {
      const found = acceptedFor(object, 'up') ?? acceptedFor(object, 'down')
      return found ? found[1].span : (bare.get(object) as Span)
    },
  }
}
