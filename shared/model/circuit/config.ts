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
  let key = ''
  for (const wire of state.wires) {
    if (state.brokenWires.length > 0 && state.brokenWires.includes(wire.id)) continue
    const a = index.get(wire.from)
    const b = index.get(wire.to)
    if (a === undefined || b === undefined) continue
    wires.push([a, b])
    key += `${a}-${b},`
  }
  const part = { wires, key }
  wiringCache.set(state.wires, { broken: state.brokenWires, part })
  return part
}

interface DevicePart {
  closedContacts: [number, number][]
  potentiometers: PotentiometerElement[]
  key: string
  /** Without potentiometer positions. */
  structureKey: string
}
const deviceCache = new WeakMap<SimState['devices'], DevicePart>()

function devicePart(state: SimState, terminals: PointLayout['terminals']): DevicePart {
  const cached = deviceCache.get(state.devices)
  if (cached) return cached
  const closedContacts: [number, number][] = []
  const potentiometers: PotentiometerElement[] = []
  let key = ''
  let structureKey = ''
  for (const id of state.deviceOrder) {
    const device = state.devices[id]
    if (device.spec.kind === 'potentiometer') {
      structureKey += 'p'
      const t = terminals[id]
      potentiometers.push({
        hi: t.hi,
        wiper: t.wiper,
        lo: t.lo,
        ohms: device.spec.ohms ?? 10_000,
        position: device.position,
      })
      key += `p${device.position}`
    } else if (contactClosed(device)) {
      closedContacts.push([terminals[id].a, terminals[id].b])
      key += '1'
      structureKey += '1'
    } else {
      key += '0'
      structureKey += '0'
    }
  }
  const part = { closedContacts, potentiometers, key, structureKey }
  deviceCache.set(state.devices, part)
  return part
}

export function circuitConfig(state: SimState, controlOn: boolean, relayClosed: boolean): CircuitConfig {
  const { points, index, terminals, layoutId } = pointsOf(state)
  const logic = state.settings.active['inputs.logic']
  const supplyEnabled = controlOn && !state.fuseBlown
  const wiring = wiringPart(state, index)
  const devices = devicePart(state, terminals)
  const closedContacts = relayClosed
    ? [...devices.closedContacts, [index.get('drive.k1a')!, index.get('drive.k1b')!] as [number, number]]
    : devices.closedContacts
  const flags = `${logic === 'sink' ? 'k' : 'o'}${supplyEnabled ? 1 : 0}${controlOn ? 1 : 0}${relayClosed ? 1 : 0}`
  return {
    points,
    pointIndex: index,
    wires: wiring.wires,
    wiresKey: wiring.key,
    closedContacts,
    potentiometers: devices.potentiometers,
    logic,
    supplyEnabled,
    referenceEnabled: controlOn,
    key: `${layoutId}${flags}|${wiring.key}|${devices.key}`,
    structureKey: `${layoutId}${flags}|${wiring.key}|${devices.structureKey}`,
  }
}
