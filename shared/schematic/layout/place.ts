// Horizontal placement: each row keeps its order (the drive's terminals in panel order, devices by the
// terminals they are wired to) and every object moves towards what it is wired to in the rows above and
// below, a few sweeps over the rows, so most wires run straight down.
import { OBJECT_GAP, SYMBOL_LEFT, deviceText, terminalBoxWidth } from './metrics'
import type { Model, RowObject, Side } from './model'
import { spreadInOrder } from './spread'

export function pinCounts(model: Model): Map<RowObject, Record<Side, number>> {
  const counts = new Map<RowObject, Record<Side, number>>()
  const add = (object: RowObject, side: Side) => {
    const c = counts.get(object) ?? { up: 0, down: 0 }
    c[side]++
    counts.set(object, c)
  }
  for (const route of model.routes) {
    for (const node of route.nodes) {
      if (node.object.kind === 'feedthrough') {
        add(node.object, 'up')
        add(node.object, 'down')
      } else add(node.object, node.anchor.side)
    }
  }
  return counts
}

function setExtents(model: Model, minSep: number): void {
  const counts = pinCounts(model)
  for (const row of model.rows) {
    for (const object of row.objects) {
      const c = counts.get(object) ?? { up: 0, down: 0 }
      const pinsHalf = (Math.max(c.up, c.down) * minSep) / 2
      if (object.kind === 'terminal') {
        const half = Math.max(terminalBoxWidth(object.terminal?.label ?? '') / 2, pinsHalf)
        object.left = half
        object.right = half
      } else if (object.kind === 'feedthrough') {
        object.left = minSep / 2
        object.right = minSep / 2
      } else {
        const shape = object.device!
        const text = deviceText(shape.device)
        const reach = Math.max(0, ...[...shape.anchors.values()].map((a) => a.dx))
        object.left = Math.max(SYMBOL_LEFT, pinsHalf)
        object.right = Math.max(text.dx + text.width + 4, pinsHalf + reach)
      }
    }
  }
}

/** Objects' neighbours along their wires in other rows: where each would like its axis to be. */
function wishes(model: Model): Map<RowObject, number[]> {
  const wish = new Map<RowObject, number[]>()
  for (const route of model.routes) {
    route.nodes.forEach((node, i) => {
      for (const other of [route.nodes[i - 1], route.nodes[i + 1]]) {
        if (!other || other.object.row === node.object.row) continue
        const list = wish.get(node.object) ?? []
        list.push(other.object.x + other.anchor.dx - node.anchor.dx)
        wish.set(node.object, list)
      }
    })
  }
  return wish
}

/** Objects wired to nothing in another row follow their left neighbour closely (weakly held). */
function placeRow(objects: readonly RowObject[], wish: Map<RowObject, number[]>): void {
  let previousWish = 0
  const items = objects.map((object, i) => {
    const list = wish.get(object)
    const previous = objects[i - 1]
    const gapBefore = previous ? previous.right + OBJECT_GAP + object.left : 0
    const own = list
      ? list.reduce((a, b) => a + b, 0) / list.length
      : previous
        ? previousWish + gapBefore
        : object.x
    previousWish = own
    return { wish: own, weight: list ? list.length : 0.05, gapBefore }
  })
  const xs = spreadInOrder(items)
  objects.forEach((object, i) => (object.x = xs[i]))
}

function packRow(objects: readonly RowObject[]): void {
  let x = 0
  objects.forEach((object, i) => {
    if (i > 0) x += objects[i - 1].right + OBJECT_GAP + object.left
    object.x = x
  })
}

/** Devices and feedthroughs in the device rows, ordered by the drive terminals they lead to. */
function orderDeviceRows(model: Model): void {
  const mean = (values: number[]) =>
    values.length ? values.reduce((a, b) => a + b, 0) / values.length : Infinity
  const endX = new Map<RowObject, number>()
  for (const row of model.rows) for (const o of row.objects) if (o.kind === 'terminal') endX.set(o, o.x)
  for (let pass = 0; pass < 2; pass++) {
    for (const object of model.deviceObjects.values()) {
      const partners = model.routes.flatMap((route) => {
        const ends = [route.nodes[0], route.nodes[route.nodes.length - 1]]
        const mine = ends.findIndex((n) => n.object === object)
        if (mine < 0) return []
        const x = endX.get(ends[1 - mine].object)
        return x === undefined || !Number.isFinite(x) ? [] : [x]
      })
      endX.set(object, mean(partners))
    }
  }
  // Devices wired to no drive terminal go after the others, in their declared order.
  const finite = [...endX.values()].filter(Number.isFinite)
  let next = (finite.length ? Math.max(...finite) : 0) + 1
  for (const object of model.deviceObjects.values()) {
    if (!Number.isFinite(endX.get(object) as number)) endX.set(object, next++)
  }
  for (const route of model.routes) {
    const ends = [route.nodes[0], route.nodes[route.nodes.length - 1]]
    const x = mean(ends.map((n) => endX.get(n.object) ?? Infinity).filter(Number.isFinite))
    for (const node of route.nodes.slice(1, -1)) endX.set(node.object, x)
  }
  for (const row of model.rows) {
    if (row.kind === 'upper' || row.kind === 'lower') {
      const declared = new Map(row.objects.map((o, i) => [o, i]))
      row.objects.sort(
        (a, b) =>
          (endX.get(a) ?? Infinity) - (endX.get(b) ?? Infinity) ||
          Number(a.kind === 'feedthrough') - Number(b.kind === 'feedthrough') ||
          (declared.get(a) as number) - (declared.get(b) as number),
      )
    } else {
      // The drive's own terminals keep their order; wires passing the strip go round its right end.
      row.objects.sort(
        (a, b) => Number(a.kind === 'feedthrough') - Number(b.kind === 'feedthrough') || a.key - b.key,
      )
    }
  }
}

const SWEEP_ORDER = ['inputs', 'upper', 'lower', 'supply', 'returns'] as const
const SWEEPS = 6

export function placeObjects(model: Model, minSep: number): void {
  setExtents(model, minSep)
  for (const row of model.rows) {
    if (row.kind !== 'upper' && row.kind !== 'lower') {
      row.objects.sort(
        (a, b) => Number(a.kind === 'feedthrough') - Number(b.kind === 'feedthrough') || a.key - b.key,
      )
    }
    packRow(row.objects.filter((o) => o.kind === 'terminal'))
  }
  orderDeviceRows(model)
  for (const row of model.rows) packRow(row.objects)
  for (let sweep = 0; sweep < SWEEPS; sweep++) {
    for (const kind of SWEEP_ORDER) {
      const row = model.rows.find((r) => r.kind === kind)
      if (row) placeRow(row.objects, wishes(model))
    }
  }
}
