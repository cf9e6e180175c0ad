// Wire tags: each sits on its own wire, and tags of wires that bunch together do not cover each other.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { layoutPanel } from '@/simulator/scene/layout'
import type { PanelDevice, Vec } from '@/simulator/scene/types'
import { distanceToCubic, pointOnCubic, wireCurve, type Cubic } from '@/simulator/scene/wireCurve'
import {
  placeWireLabels,
  preferredT,
  WIRE_LABEL_HEIGHT,
  WIRE_LABEL_WIDTH,
} from '@/simulator/scene/wireLabels'

const devices: PanelDevice[] = [
  { id: 'runSwitch', kind: 'selector', label: 'Infeed run / stop', contact: 'NO' },
  { id: 'raise', kind: 'pushbutton', label: 'Faster', contact: 'NO' },
  { id: 'lower', kind: 'pushbutton', label: 'Slower', contact: 'NO' },
]
const layout = layoutPanel(devices)

/** The raise/lower commissioning wiring, in the order the keyboard test adds it (W1 … W7). */
const commissioning: [string, string][] = [
  ['drive.p24', 'runSwitch.a'],
  ['runSwitch.a', 'raise.a'],
  ['raise.a', 'lower.a'],
  ['runSwitch.b', 'drive.di1'],
  ['raise.b', 'drive.di2'],
  ['lower.b', 'drive.di3'],
  ['drive.dcom', 'drive.0v'],
]

function curvesFor(pairs: [string, string][]) {
  return pairs.map(([from, to], lane) => ({
    lane,
    curve: wireCurve(layout.terminals[from], layout.terminals[to], lane),
  }))
}

/** Axis-aligned boxes of the tag size overlap when both centre distances are under the box size. */
const covers = (a: Vec, b: Vec) =>
  Math.abs(a.x - b.x) < WIRE_LABEL_WIDTH && Math.abs(a.y - b.y) < WIRE_LABEL_HEIGHT

function overlappingPairs(spots: Vec[]) {
  const pairs: [number, number][] = []
  spots.forEach((a, i) => spots.slice(i + 1).forEach((b, j) => covers(a, b) && pairs.push([i, i + j + 1])))
  return pairs
}

describe('wire tags', () => {
  it('would collide on the commissioning wiring if every tag kept its lane spot', () => {
    // Guards the next test: the layout really does bunch wires (W4 and W5 near DI2).
    const naive = curvesFor(commissioning).map(({ curve, lane }) => pointOnCubic(curve, preferredT(lane)))
    expect(overlappingPairs(naive).length).toBeGreaterThan(0)
  })

  it('keeps every tag of the commissioning wiring clear of the others', () => {
    expect(overlappingPairs(placeWireLabels(curvesFor(commissioning)))).toEqual([])
  })

  it('puts a tag on a wire that has no neighbours at its lane spot', () => {
    const [only] = curvesFor([['drive.p24', 'drive.di4']])
    expect(placeWireLabels([only])).toEqual([pointOnCubic(only.curve, preferredT(0))])
  })

  it('always puts each tag on its own wire, however the wires run', () => {
    const point = fc.record({ x: fc.integer({ min: 0, max: 1280 }), y: fc.constant(410) })
    fc.assert(
      fc.property(fc.array(fc.tuple(point, point), { minLength: 1, maxLength: 12 }), (ends) => {
        const wires = ends.map(([a, b], lane) => ({ lane, curve: wireCurve(a, b, lane) as Cubic }))
        placeWireLabels(wires).forEach((spot, i) =>
          expect(distanceToCubic(wires[i].curve, spot)).toBeLessThan(1),
        )
      }),
    )
  })

  it('gives as many tags as wires, in the same order', () => {
    const wires = curvesFor(commissioning)
    const spots = placeWireLabels(wires)
    expect(spots).toHaveLength(wires.length)
    // The first wire is placed before any other, so it keeps its lane spot.
    expect(spots[0]).toEqual(pointOnCubic(wires[0].curve, preferredT(0)))
  })
})
