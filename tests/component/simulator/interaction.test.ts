// Pointer gestures on the panel, from hit-testing to the intents they produce.
import { describe, expect, it } from 'vitest'
import { hitTest, probeTip } from '@/simulator/scene/hitTest'
import {
  cancelArmed,
  IDLE,
  pointerCancel,
  pointerDown,
  pointerMove,
  pointerUp,
} from '@/simulator/scene/interaction'
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
    const down = pointerDown(ctx, IDLE, { kind: 'terminal', point: 'drive.p24' }, at('drive.p24'))
    const moved = pointerMove(down.gesture, { x: 600, y: 500 })
    const up = pointerUp(ctx, moved.gesture, { kind: 'terminal', point: 'up.a' })
    expect(up.intents).toEqual([{ type: 'wire.add', from: 'drive.p24', to: 'up.a' }])
    expect(up.gesture).toEqual(IDLE)
  })

  it('adds no wire when dragged from a terminal and dropped on nothing', () => {
    const down = pointerDown(ctx, IDLE, { kind: 'terminal', point: 'drive.p24' }, at('drive.p24'))
    const dropped = pointerUp(ctx, down.gesture, null)
    expect(dropped.intents).toEqual([])
    expect(dropped.gesture).toEqual(IDLE)
  })

  it('refuses to start a wire on a power terminal (those are for the meter only)', () => {
    expect(pointerDown(ctx, IDLE, { kind: 'terminal', point: 'drive.l1' }, at('drive.l1')).gesture).toEqual(
      IDLE,
    )
  })

  it('holds a momentary button while the pointer is down and releases it on up or cancel', () => {
    const down = pointerDown(ctx, IDLE, { kind: 'device', device: 'up' }, { x: 0, y: 0 })
    expect(down.intents).toEqual([{ type: 'device.press', device: 'up' }])
    expect(pointerUp(ctx, down.gesture, null).intents).toEqual([{ type: 'device.release', device: 'up' }])
    expect(pointerCancel(down.gesture).intents).toEqual([{ type: 'device.release', device: 'up' }])
  })

  it('switches a maintained selector with one click', () => {
    expect(pointerDown(ctx, IDLE, { kind: 'device', device: 'run' }, { x: 0, y: 0 }).intents).toEqual([
      { type: 'device.toggle', device: 'run' },
    ])
  })

  it('turns the potentiometer by dragging sideways, clamped to its travel', () => {
    const down = pointerDown(ctx, IDLE, { kind: 'device', device: 'pot' }, { x: 100, y: 0 })
    const right = pointerMove(down.gesture, { x: 140, y: 0 })
    expect(right.intents).toEqual([{ type: 'device.turn', device: 'pot', position: 0.75 }])
    const far = pointerMove(right.gesture, { x: 900, y: 0 })
    expect(far.intents).toEqual([{ type: 'device.turn', device: 'pot', position: 1 }])
  })

  it('places a dragged probe on a terminal, or lifts it when dropped elsewhere', () => {
    const down = pointerDown(ctx, IDLE, { kind: 'probe', probe: 'black' }, { x: 0, y: 0 })
    expect(pointerUp(ctx, down.gesture, { kind: 'terminal', point: 'drive.0v' }).intents).toEqual([
      { type: 'probe.place', probe: 'black', point: 'drive.0v' },
    ])
    expect(pointerUp(ctx, down.gesture, null).intents).toEqual([
      { type: 'probe.place', probe: 'black', point: null },
    ])
  })

  it('pans the view when the empty panel is dragged, and deselects the wire', () => {
    const down = pointerDown(ctx, IDLE, null, { x: 5, y: 635 })
    expect(down.gesture).toEqual({ kind: 'panning' })
    expect(down.intents).toEqual([{ type: 'wire.select', wire: null }])
  })
})

describe('wiring by tap-tap (mouse, pen and touch alike)', () => {
  const tap = (gesture: ReturnType<typeof pointerDown>['gesture'], point: string) => {
    const hit = { kind: 'terminal' as const, point }
    const down = pointerDown(ctx, gesture, hit, at(point))
    const up = pointerUp(ctx, down.gesture, hit)
    return { gesture: up.gesture, intents: [...down.intents, ...up.intents] }
  }

  it('arms a wire on the first tap and adds it on a tap on another terminal', () => {
    const first = tap(IDLE, 'drive.p24')
    expect(first.intents).toEqual([{ type: 'wire.start', from: 'drive.p24' }])
    expect(first.gesture).toMatchObject({ kind: 'armed', from: 'drive.p24' })
    // The pointer is released after every tap: that must not let go of the armed wire.
    expect(pointerCancel(first.gesture).gesture).toEqual(first.gesture)
    const second = tap(first.gesture, 'up.a')
    expect(second.intents).toEqual([{ type: 'wire.add', from: 'drive.p24', to: 'up.a' }])
    expect(second.gesture).toEqual(IDLE)
  })

  it('lets the wire go on a second tap on the same terminal, on empty panel, or with Escape', () => {
    const armed = tap(IDLE, 'drive.di1').gesture
    expect(tap(armed, 'drive.di1')).toEqual({ gesture: IDLE, intents: [{ type: 'wire.cancel' }] })
    const empty = pointerDown(ctx, armed, null, { x: 5, y: 635 })
    expect(empty.intents).toEqual([{ type: 'wire.cancel' }, { type: 'wire.select', wire: null }])
    expect(cancelArmed(armed)).toEqual({ gesture: IDLE, intents: [{ type: 'wire.cancel' }] })
  })

  it('does not end a tap-tap wire on a power terminal (those are for the meter only)', () => {
    const armed = tap(IDLE, 'drive.di1').gesture
    expect(pointerDown(ctx, armed, { kind: 'terminal', point: 'drive.l1' }, at('drive.l1')).intents).toEqual([
      { type: 'wire.cancel' },
    ])
  })

  it('lets go of the armed wire and does what a tap elsewhere always does', () => {
    const armed = tap(IDLE, 'drive.di1').gesture
    expect(pointerDown(ctx, armed, { kind: 'device', device: 'run' }, { x: 0, y: 0 }).intents).toEqual([
      { type: 'wire.cancel' },
      { type: 'device.toggle', device: 'run' },
    ])
  })

  it('the draft wire follows the pointer while armed', () => {
    const armed = tap(IDLE, 'drive.di1').gesture
    expect(pointerMove(armed, { x: 300, y: 500 }).gesture).toMatchObject({
      kind: 'armed',
      at: { x: 300, y: 500 },
    })
  })
})

describe('the meter’s function selector', () => {
  it('has one key per position, inside the meter and clear of its window, holsters and each other', () => {
    const { rect, display, holsters, selector } = layout.meter
    expect(selector.map((k) => k.mode)).toEqual(['off', 'acVolts', 'dcVolts', 'resistance', 'continuity'])
    const inside = (r: { x: number; y: number; w: number; h: number }) =>
      r.x >= rect.x && r.y >= rect.y && r.x + r.w <= rect.x + rect.w && r.y + r.h <= rect.y + rect.h
    const apart = (a: typeof display, b: typeof display) =>
      a.x + a.w <= b.x || b.x + b.w <= a.x || a.y + a.h <= b.y || b.y + b.h <= a.y
    for (const key of selector) {
      expect(inside(key.rect)).toBe(true)
      expect(apart(key.rect, display)).toBe(true)
      for (const h of Object.values(holsters)) expect(key.rect.y + key.rect.h).toBeLessThan(h.y)
      for (const other of selector) if (other !== key) expect(apart(key.rect, other.rect)).toBe(true)
    }
  })

  it('turns the selector where the apprentice clicks it', () => {
    for (const key of layout.meter.selector) {
      const centre = { x: key.rect.x + key.rect.w / 2, y: key.rect.y + key.rect.h / 2 }
      const hit = hitTest(layout, noWires, centre)
      expect(hit).toEqual({ kind: 'meterMode', mode: key.mode })
      expect(pointerDown(ctx, IDLE, hit, centre).intents).toEqual([{ type: 'meter.mode', mode: key.mode }])
    }
  })
})
