// Pointer gestures on the scene, as a pure reducer: each pointer event gives the next gesture and
// the intents (user actions) it produced. The Vue wrapper turns intents into model events.
//
// A wire is drawn either by dragging from one terminal to another, or by tapping one terminal and then
// another (tap-tap: the first tap arms a wire from that terminal; a tap on the same terminal, on empty
// panel or on anything else lets it go). Mouse, pen and touch work the same way.
import type { Hit } from './hitTest'
import type { KeypadKey, MeterMode, PanelLayout, PointId, ProbeColour, Vec } from './types'

export type Gesture =
  | { kind: 'idle' }
  /** Pointer held down on a terminal: a drag draws a wire, a release on the same terminal arms one. */
  | { kind: 'wiring'; from: PointId; at: Vec }
  /** A wire waiting for its second terminal (tap-tap); the draft follows the pointer. */
  | { kind: 'armed'; from: PointId; at: Vec }
  | { kind: 'holding'; device: string }
  | { kind: 'probe'; probe: ProbeColour; at: Vec }
  | { kind: 'turning'; device: string; startX: number; startPosition: number; position: number }
  /** Dragging the empty panel moves the view (the stage does the moving, in screen pixels). */
  | { kind: 'panning' }

export type Intent =
  | { type: 'wire.add'; from: PointId; to: PointId }
  | { type: 'wire.start'; from: PointId }
  | { type: 'wire.cancel' }
  | { type: 'wire.remove'; wire: string }
  | { type: 'wire.select'; wire: string | null }
  | { type: 'device.press'; device: string }
  | { type: 'device.release'; device: string }
  | { type: 'device.toggle'; device: string }
  | { type: 'device.turn'; device: string; position: number }
  | { type: 'keypad'; key: KeypadKey }
  | { type: 'disconnect.toggle' }
  /** The lock point: applies the apprentice's lock, or asks to confirm removing it. */
  | { type: 'lock.toggle' }
  /** Removal confirmed. */
  | { type: 'lock.remove' }
  /** An attempt to remove the story's supervisor lock (the model refuses it). */
  | { type: 'supervisorLock.remove' }
  /** Ask the supervisor to remove their own lock. */
  | { type: 'supervisorLock.ask' }
  | { type: 'meter.mode'; mode: MeterMode }
  | { type: 'probe.place'; probe: ProbeColour; point: PointId | null }

export interface GestureResult {
  gesture: Gesture
  intents: Intent[]
}

export interface InteractionContext {
  layout: PanelLayout
  /** Current potentiometer positions (0..1), to turn from. */
  positions: Record<string, number>
}

export const IDLE: Gesture = { kind: 'idle' }
/** Scene units of horizontal drag for a full turn of a potentiometer. */
const TURN_SPAN = 160

function isWireable(ctx: InteractionContext, point: PointId): boolean {
  return !!ctx.layout.terminals[point]?.wireable
}

export function pointerDown(
  ctx: InteractionContext,
  gesture: Gesture,
  hit: Hit | null,
  p: Vec,
): GestureResult {
  if (gesture.kind === 'armed') {
    if (hit?.kind === 'terminal' && hit.point !== gesture.from && isWireable(ctx, hit.point)) {
      return { gesture: IDLE, intents: [{ type: 'wire.add', from: gesture.from, to: hit.point }] }
    }
    // Anywhere else lets the wire go; a tap on something else also does what it always does.
    const rest = hit?.kind === 'terminal' ? { gesture: IDLE, intents: [] } : pointerDown(ctx, IDLE, hit, p)
    return { gesture: rest.gesture, intents: [{ type: 'wire.cancel' }, ...rest.intents] }
  }
  if (!hit) return { gesture: { kind: 'panning' }, intents: [{ type: 'wire.select', wire: null }] }
  switch (hit.kind) {
    case 'terminal':
      return isWireable(ctx, hit.point)
        ? { gesture: { kind: 'wiring', from: hit.point, at: p }, intents: [] }
        : { gesture: IDLE, intents: [] }
    case 'device': {
      const device = ctx.layout.devices.find((d) => d.id === hit.device)
      if (!device) return { gesture: IDLE, intents: [] }
      if (device.kind === 'pushbutton') {
        return {
          gesture: { kind: 'holding', device: device.id },
          intents: [{ type: 'device.press', device: device.id }],
        }
      }
      if (device.kind === 'selector')
        return { gesture: IDLE, intents: [{ type: 'device.toggle', device: device.id }] }
      const position = ctx.positions[device.id] ?? 0
      return {
        gesture: { kind: 'turning', device: device.id, startX: p.x, startPosition: position, position },
        intents: [],
      }
    }
    case 'key':
      return { gesture: IDLE, intents: [{ type: 'keypad', key: hit.key }] }
    case 'disconnect':
      return { gesture: IDLE, intents: [{ type: 'disconnect.toggle' }] }
    case 'lock':
      return { gesture: IDLE, intents: [{ type: 'lock.toggle' }] }
    case 'meterMode':
      return { gesture: IDLE, intents: [{ type: 'meter.mode', mode: hit.mode }] }
    case 'probe':
      return { gesture: { kind: 'probe', probe: hit.probe, at: p }, intents: [] }
    case 'wire':
      return { gesture: IDLE, intents: [{ type: 'wire.select', wire: hit.wire }] }
  }
}

export function pointerMove(gesture: Gesture, p: Vec): GestureResult {
  switch (gesture.kind) {
    case 'wiring':
    case 'armed':
    case 'probe':
      return { gesture: { ...gesture, at: p }, intents: [] }
    case 'turning': {
      const raw = gesture.startPosition + (p.x - gesture.startX) / TURN_SPAN
      const position = Math.round(Math.max(0, Math.min(1, raw)) * 100) / 100
      if (position === gesture.position) return { gesture, intents: [] }
      return {
        gesture: { ...gesture, position },
        intents: [{ type: 'device.turn', device: gesture.device, position }],
      }
    }
    default:
      return { gesture, intents: [] }
  }
}

export function pointerUp(ctx: InteractionContext, gesture: Gesture, hit: Hit | null): GestureResult {
  switch (gesture.kind) {
    case 'wiring': {
      const target = hit?.kind === 'terminal' ? hit.point : null
      // Let go on the terminal it started from: a tap, which arms a wire from there.
      if (target === gesture.from) {
        return {
          gesture: { kind: 'armed', from: gesture.from, at: gesture.at },
          intents: [{ type: 'wire.start', from: gesture.from }],
        }
      }
      const ok = target !== null && isWireable(ctx, target)
      return { gesture: IDLE, intents: ok ? [{ type: 'wire.add', from: gesture.from, to: target }] : [] }
    }
    case 'armed':
      return { gesture, intents: [] }
    case 'holding':
      return { gesture: IDLE, intents: [{ type: 'device.release', device: gesture.device }] }
    case 'probe': {
      // Dropping a probe anywhere but on a point lifts it back to the meter.
      const point = hit?.kind === 'terminal' ? hit.point : null
      return { gesture: IDLE, intents: [{ type: 'probe.place', probe: gesture.probe, point }] }
    }
    default:
      return { gesture: IDLE, intents: [] }
  }
}

/**
 * The pointer left or was taken away: never leave a momentary button held. An armed wire stays armed
 * (the pointer is released after every tap); Escape lets it go with `cancelArmed`.
 */
export function pointerCancel(gesture: Gesture): GestureResult {
  if (gesture.kind === 'holding') {
    return { gesture: IDLE, intents: [{ type: 'device.release', device: gesture.device }] }
  }
  if (gesture.kind === 'armed') return { gesture, intents: [] }
  return { gesture: IDLE, intents: [] }
}

export function cancelArmed(gesture: Gesture): GestureResult {
  return gesture.kind === 'armed'
    ? { gesture: IDLE, intents: [{ type: 'wire.cancel' }] }
    : { gesture, intents: [] }
}
