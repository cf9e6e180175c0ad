// Pointer gestures on the scene, as a pure reducer: each pointer event gives the next gesture and
// the intents (user actions) it produced. The Vue wrapper turns intents into model events.
import type { Hit } from './hitTest'
import type { KeypadKey, PanelLayout, PointId, ProbeColour, Vec } from './types'

export type Gesture =
  | { kind: 'idle' }
  | { kind: 'wiring'; from: PointId; at: Vec }
  | { kind: 'holding'; device: string }
  | { kind: 'probe'; probe: ProbeColour; at: Vec }
  | { kind: 'turning'; device: string; startX: number; startPosition: number; position: number }

export type Intent =
  | { type: 'wire.add'; from: PointId; to: PointId }
  | { type: 'wire.select'; wire: string | null }
  | { type: 'device.press'; device: string }
  | { type: 'device.release'; device: string }
  | { type: 'device.toggle'; device: string }
  | { type: 'device.turn'; device: string; position: number }
  | { type: 'keypad'; key: KeypadKey }
  | { type: 'disconnect.toggle' }
  | { type: 'lock.toggle' }
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

export function pointerDown(ctx: InteractionContext, hit: Hit | null, p: Vec): GestureResult {
  if (!hit) return { gesture: IDLE, intents: [{ type: 'wire.select', wire: null }] }
  switch (hit.kind) {
    case 'terminal': {
      const spot = ctx.layout.terminals[hit.point]
      return spot?.wireable
        ? { gesture: { kind: 'wiring', from: hit.point, at: p }, intents: [] }
        : { gesture: IDLE, intents: [] }
    }
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
    case 'probe':
      return { gesture: { kind: 'probe', probe: hit.probe, at: p }, intents: [] }
    case 'wire':
      return { gesture: IDLE, intents: [{ type: 'wire.select', wire: hit.wire }] }
  }
}

export function pointerMove(gesture: Gesture, p: Vec): GestureResult {
  switch (gesture.kind) {
    case 'wiring':
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
      const target = hit?.kind === 'terminal' ? ctx.layout.terminals[hit.point] : undefined
      const ok = target?.wireable && target.id !== gesture.from
      return { gesture: IDLE, intents: ok ? [{ type: 'wire.add', from: gesture.from, to: target.id }] : [] }
    }
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

/** The pointer left or was taken away: never leave a momentary button held. */
export function pointerCancel(gesture: Gesture): GestureResult {
  if (gesture.kind === 'holding') {
    return { gesture: IDLE, intents: [{ type: 'device.release', device: gesture.device }] }
  }
  return { gesture: IDLE, intents: [] }
}
