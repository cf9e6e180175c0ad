// Turns a simulation state into the control network's configuration (and its memo key).
// The wiring part and the device part are cached per (immutable) array/object, so building a
// configuration for an unchanged circuit costs a few lookups.
import { controlPointsFor, DEVICE_TERMINALS, type PointId } from '../points'
import type { DeviceState, SimState } from '../types'
import type { CircuitConfig, PotentiometerElement } from './controlCircuit'

interface PointLayout {
  points: PointId[]
  index: Map<PointId, number>
  /** Point indices of each device's terminals, by terminal name. */
  terminals: Record<string, Record<string, number>>
  /** Short id of the device layout, so memo keys of different layouts never collide. */
  layoutId: number
}
const layoutCache = new WeakMap<readonly string[], PointLayout>()
const layoutIds = new Map<string, number>()

/** Points of the control network for a simulation's devices (cached per device list). */
export function pointsOf(state: SimState): PointLayout {
  let entry = layoutCache.get(state.deviceOrder)
  if (!entry) {
    const specs = state.deviceOrder.map((id) => state.devices[id].spec)
    const points = controlPointsFor(specs)
    const signature = specs.map((d) => `${d.id}:${d.kind}:${d.ohms ?? ''}`).join(',')
    let layoutId = layoutIds.get(signature)
    if (layoutId === undefined) {
      layoutId = layoutIds.size
      layoutIds.set(signature, layoutId)
    }
    const index = new Map(points.map((p, i) => [p, i]))
    const terminals: Record<string, Record<string, number>> = {}
    for (const spec of specs) {
      terminals[spec.id] = Object.fromEntries(
        DEVICE_TERMINALS[spec.kind].map((t) => [t, index.get(`${spec.id}.${t}`)!]),
      )
    }
    entry = { points, index, terminals, layoutId }
    layoutCache.set(state.deviceOrder, entry)
  }
  return entry
}

/** Whether a device's contact is closed now, with its injected fault taken into account. */
export function contactClosed(device: DeviceState): boolean {
  if (device.fault === 'failedOpen') return false
  if (device.fault === 'welded') return true
  const declared = device.contact
  const behaves = device.fault === 'wrongType' ? (declared === 'NO' ? 'NC' : 'NO') : declared
  const actuated = device.spec.kind === 'pushbutton' ? device.pressed : device.position === 1
  return behaves === 'NO' ? actuated : !actuated
}

interface WiringPart {
  wires: [number, number][]
  key: string
}
const wiringCache = new WeakMap<SimState['wires'], { broken: SimState['brokenWires']; part: WiringPart }>()

function wiringPart(state: SimState, index: Map<PointId, number>): WiringPart {
  const cached = wiringCache.get(state.wires)
  if (cached && cached.broken === state.brokenWires) return cached.part
  const wires: [number, number][] = []
  for (const wire of state.wires) {
    if (state.brokenWires.length > 0 && state.brokenWires.includes(wire.id)) continue
    const a = index.get(wire.from)
    const b = index.get(wire.to)
    if (a === undefined || b === undefined) continue
    wires.push(a < b ? [a, b] : [b, a])
  }
  // Nets do not depend on the order or direction of wires: a canonical key lets rewired-back circuits share memos.
  wires.sort((x, y) => x[0] - y[0] || x[1] - y[1])
  const part = { wires, key: wires.map(([a, b]) => `${a}-${b}`).join(',') }
  wiringCache.set(state.wires, { broken: state.brokenWires, part })
  return part
}

interface DevicePart {
  closedContacts: [number, number][]
  potentiometers: PotentiometerElement[]
}
const deviceCache = new WeakMap<SimState['devices'], DevicePart>()

function devicePart(state: SimState, terminals: PointLayout['terminals']): DevicePart {
  const cached = deviceCache.get(state.devices)
  if (cached) return cached
  const closedContacts: [number, number][] = []
  const potentiometers: PotentiometerElement[] = []
  for (const id of state.deviceOrder) {
    const device = state.devices[id]
    const t = terminals[id]
    if (device.spec.kind === 'potentiometer') {
      potentiometers.push({
        hi: t.hi,
        wiper: t.wiper,
        lo: t.lo,
        ohms: device.spec.ohms ?? 10_000,
        position: device.position,
      })
    } else if (contactClosed(device)) {
      closedContacts.push([t.a, t.b])
    }
  }
  const part = { closedContacts, potentiometers }
  deviceCache.set(state.devices, part)
  return part
}

/** Cheap identity of the devices' electrical state: contacts (structure) and wiper positions. */
interface DeviceKeys {
  structure: string
  positions: string
}
function deviceKeys(state: SimState): DeviceKeys {
  let structure = ''
  let positions = ''
  for (const id of state.deviceOrder) {
    const device = state.devices[id]
    if (device.spec.kind === 'potentiometer') {
      structure += 'p'
      positions += `${device.position},`
    } else structure += contactClosed(device) ? '1' : '0'
  }
  return { structure, positions }
}

/** Full structure keys, interned per wiring so that equal keys are the same string (hash cached). */
const structureKeys = new WeakMap<WiringPart, Map<string, string>>()

export interface CircuitKeys {
  /** Wiring, contacts, sources, logic, relay: everything but potentiometer positions. */
  structure: string
  positions: string
}

export function circuitKeys(state: SimState, controlOn: boolean, relayClosed: boolean): CircuitKeys {
  const { index, layoutId } = pointsOf(state)
  const wiring = wiringPart(state, index)
  const devices = deviceKeys(state)
  const logic = state.settings.active['inputs.logic']
  const supplyEnabled = controlOn && !state.fuseBlown
  const local = `${logic === 'sink' ? 'k' : 'o'}${supplyEnabled ? 1 : 0}${controlOn ? 1 : 0}${relayClosed ? 1 : 0}${devices.structure}`
  let byLocal = structureKeys.get(wiring)
  if (!byLocal) {
    byLocal = new Map()
    structureKeys.set(wiring, byLocal)
  }
  let structure = byLocal.get(local)
  if (structure === undefined) {
    structure = `${layoutId}|${wiring.key}|${local}`
    byLocal.set(local, structure)
  }
  return { structure, positions: devices.positions }
}

export function circuitConfig(state: SimState, controlOn: boolean, relayClosed: boolean): CircuitConfig {
  const { points, index, terminals } = pointsOf(state)
  const keys = circuitKeys(state, controlOn, relayClosed)
  const wiring = wiringPart(state, index)
  const devices = devicePart(state, terminals)
  const closedContacts = relayClosed
    ? [...devices.closedContacts, [index.get('drive.k1a')!, index.get('drive.k1b')!] as [number, number]]
    : devices.closedContacts
  return {
    points,
    pointIndex: index,
    wires: wiring.wires,
    wiresKey: wiring.key,
    closedContacts,
    potentiometers: devices.potentiometers,
    logic: state.settings.active['inputs.logic'],
    supplyEnabled: controlOn && !state.fuseBlown,
    referenceEnabled: controlOn,
    key: `${keys.structure}#${keys.positions}`,
    structureKey: keys.structure,
  }
}
