// Pointer gestures on the panel, from hit-testing to the intents they produce.
import { describe, expect, it } from 'vitest'
import { hitTest, probeTip } from '@/simulator/scene/hitTest'
import { IDLE, pointerCancel, pointerDown, pointerMove, pointerUp } from '@/simulator/scene/interaction'
import { layoutPanel } from '@/simulator/scene/layout'
import { pointOnCubic, wireCurve } from '@/simulator/scene/wireCurve'

const layout = layoutPanel([
  { id: 'run', kind: 'selector', label: 'Run', contact: 'NO' },
  { id: 'up', kind: 'pushbutton', label: 'Faster', contact: 'NO' },
  { id: 'pot', kind: 'potentiometer', label: 'Pot' },
])
const noWires = { wires: [], probes: { red: null, black: null } }
const ctx = { layout, positions: { pot: 0.5 } }
const at = (id: string) => ({ x: layout.terminals[id].x, y: layout.terminals[id].y })

describe('hit-testing', () => {
  it('finds the terminal under the pointer', () => {
    expect(hitTest(layout, noWires, at('drive.di1'))).toEqual({ kind: 'terminal', point: 'drive.di1' })
  })

  it('finds a wire by its curve, not by its end points', () => {
    const wires = [{ id: 'w1', from: 'drive.p24', to: 'up.a' }]
    const mid = pointOnCubic(wireCurve(at('drive.p24'), at('up.a'), 0), 0.5)
    expect(hitTest(layout, { ...noWires, wires }, mid)).toEqual({ kind: 'wire', wire: 'w1' })
  })

  it('finds a placed probe before the terminal it sits on', () => {
    const probes = { red: 'drive.dcp', black: null }
    const tip = probeTip(layout, 'red', 'drive.dcp')
    expect(hitTest(layout, { wires: [], probes }, { x: tip.x, y: tip.y - 10 })).toEqual({
      kind: 'probe',
      probe: 'red',
    })
  })

  it('finds nothing on empty backplate', () => {
    expect(hitTest(layout, noWires, { x: 5, y: 635 })).toBeNull()
  })
})

describe('pointer gestures', () => {
  it('adds a wire when dragged from one terminal to another', () => {
    const down = pointerDown(ctx, { kind: 'terminal', point: 'drive.p24' }, at('drive.p24'))
    const moved = pointerMove(down.gesture, { x: 600, y: 500 })
    const up = pointerUp(ctx, moved.gesture, { kind: 'terminal', point: 'up.a' })
    expect(up.intents).toEqual([{ type: 'wire.add', from: 'drive.p24', to: 'up.a' }])
    expect(up.gesture).toEqual(IDLE)
  })

  it('adds no wire when dropped on the terminal it started from or on nothing', () => {
    const down = pointerDown(ctx, { kind: 'terminal', point: 'drive.p24' }, at('drive.p24'))
    expect(pointerUp(ctx, down.gesture, { kind: 'terminal', point: 'drive.p24' }).intents).toEqual([])
    expect(pointerUp(ctx, down.gesture, null).intents).toEqual([])
  })

  it('refuses to start a wire on a power terminal (those are for the meter only)', () => {
    expect(pointerDown(ctx, { kind: 'terminal', point: 'drive.l1' }, at('drive.l1')).gesture).toEqual(IDLE)
  })

  it('holds a momentary button while the pointer is down and releases it on up or cancel', () => {
    const down = pointerDown(ctx, { kind: 'device', device: 'up' }, { x: 0, y: 0 })
    expect(down.intents).toEqual([{ type: 'device.press', device: 'up' }])
    expect(pointerUp(ctx, down.gesture, null).intents).toEqual([{ type: 'device.release', device: 'up' }])
    expect(pointerCancel(down.gesture).intents).toEqual([{ type: 'device.release', device: 'up' }])
  })

  it('switches a maintained selector with one click', () => {
    expect(pointerDown(ctx, { kind: 'device', device: 'run' }, { x: 0, y: 0 }).intents).toEqual([
      { type: 'device.toggle', device: 'run' },
    ])
  })

  it('turns the potentiometer by dragging sideways, clamped to its travel', () => {
    const down = pointerDown(ctx, { kind: 'device', device: 'pot' }, { x: 100, y: 0 })
    const right = pointerMove(down.gesture, { x: 140, y: 0 })
    expect(right.intents).toEqual([{ type: 'device.turn', device: 'pot', position: 0.75 }])
    const far = pointerMove(right.gesture, { x: 900, y: 0 })
    expect(far.intents).toEqual([{ type: 'device.turn', device: 'pot', position: 1 }])
  })

  it('places a dragged probe on a terminal, or lifts it when dropped elsewhere', () => {
    const down = pointerDown(ctx, { kind: 'probe', probe: 'black' }, { x: 0, y: 0 })
    expect(pointerUp(ctx, down.gesture, { kind: 'terminal', point: 'drive.0v' }).intents).toEqual([
      { type: 'probe.place', probe: 'black', point: 'drive.0v' },
    ])
    expect(pointerUp(ctx, down.gesture, null).intents).toEqual([
      { type: 'probe.place', probe: 'black', point: null },
    ])
  })
})
