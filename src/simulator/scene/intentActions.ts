// What each pointer or keyboard intent records in the attempt: the model events to send, given the
// model state now. Pure, so the mapping is tested without a panel.
import type { AttemptEvent } from '@shared/model/events'
import type { LockTag } from '@shared/model/setup'
import type { SimState } from '@shared/model/types'
import type { Intent } from './interaction'
import { DEFAULT_WIRE_COLOUR, isWireColour } from './wireColours'

type DistributiveOmit<T, K extends PropertyKey> = T extends unknown ? Omit<T, K> : never
/** What the panel asks to record; the live-attempt machine stamps the simulated time. */
export type PanelAction = DistributiveOmit<AttemptEvent, 't'>

/** The next free wire id (w1, w2 …), never reusing the id of a wire still on the panel. */
export function nextWireId(sim: Pick<SimState, 'wires'>): string {
  const used = new Set(sim.wires.map((w) => w.id))
  let n = sim.wires.length + 1
  while (used.has(`w${n}`)) n++
  return `w${n}`
}

/** The actions an intent records; `tag` is what the apprentice's lock tag says when they apply it. */
export function actionsFor(intent: Intent, sim: SimState, colour: string, tag?: LockTag): PanelAction[] {
  switch (intent.type) {
    case 'wire.add':
      return [
        {
          type: 'wire.added',
          id: nextWireId(sim),
          from: intent.from,
          to: intent.to,
          colour: isWireColour(colour) ? colour : DEFAULT_WIRE_COLOUR,
        },
      ]
    case 'wire.remove':
      return [{ type: 'wire.removed', id: intent.wire }]
    case 'wire.select':
    case 'wire.start':
    case 'wire.cancel':
      return []
    case 'device.press':
      return [{ type: 'device.pressed', device: intent.device }]
    case 'device.release':
      return [{ type: 'device.released', device: intent.device }]
    case 'device.toggle':
      return [
        {
          type: 'device.switched',
          device: intent.device,
          position: (sim.devices[intent.device]?.position ?? 0) >= 1 ? 0 : 1,
        },
      ]
    case 'device.turn':
      return [{ type: 'device.turned', device: intent.device, position: intent.position }]
    case 'keypad':
      return [{ type: 'keypad.key', key: intent.key }]
    case 'disconnect.toggle':
      return [{ type: sim.power.on ? 'power.off' : 'power.on' }]
    case 'lock.toggle':
      // Removing goes through a confirmation (the page asks, then sends lock.remove).
      if (sim.power.locked) return []
      return [tag ? { type: 'lock.applied', tag } : { type: 'lock.applied' }]
    case 'lock.remove':
      return sim.power.locked ? [{ type: 'lock.removed' }] : []
    case 'supervisorLock.remove':
      return [{ type: 'lock.removed', whose: 'supervisor' }]
    case 'supervisorLock.ask':
      return sim.power.supervisorLock ? [{ type: 'supervisorLock.removed' }] : []
    case 'probe.place': {
      const probes = { red: sim.meter.red, black: sim.meter.black, [intent.probe]: intent.point }
      // The meter stays on whatever position the apprentice chose: choosing it is part of the skill.
      return [{ type: 'meter.probes', red: probes.red, black: probes.black }]
    }
    case 'meter.mode':
      return sim.meter.mode === intent.mode ? [] : [{ type: 'meter.mode', mode: intent.mode }]
  }
}
