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
  /** This layout's distinct wirings, bucketed by a hash of their codes. */
  wirings: Map<number, WiringPart[]>
}
const layoutCache = new WeakMap<readonly string[], PointLayout>()
const layoutIds = new Map<string, number>()

/** Points of the control network for a simulation's devices (cached per device list). */
let lastOrder: readonly string[] | null = null
let lastLayout: PointLayout | null = null

export function pointsOf(state: SimState): PointLayout {
  // The same device list as last time (nearly always): skip the WeakMap.
  if (state.deviceOrder === lastOrder) return lastLayout!
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
    entry = { points, index, terminals, layoutId, wirings: wiringsByLayout(layoutId) }
    layoutCache.set(state.deviceOrder, entry)
  }
  lastOrder = state.deviceOrder
  lastLayout = entry
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
  /** Each wire as one number (lower end × point count + upper end), sorted: the part's identity. */
  codes: number[]
}
const wiringCache = new WeakMap<
  SimState['wires'],
  { broken: SimState['brokenWires']; layout: PointLayout; part: WiringPart }
>()
/**
 * One part per distinct wiring of a layout (so a circuit rewired back finds its memos again). Per
 * layout: the same point indices mean different terminals on another panel.
 */
const wiringsOfLayout = new Map<number, Map<number, WiringPart[]>>()
const WIRING_LIMIT = 4096

function wiringsByLayout(layoutId: number): Map<number, WiringPart[]> {
  let wirings = wiringsOfLayout.get(layoutId)
  if (!wirings) {
    wirings = new Map()
    wiringsOfLayout.set(layoutId, wirings)
  }
  return wirings
}

let lastWiringLayout: PointLayout | null = null
let lastWires: SimState['wires'] | null = null
let lastBroken: SimState['brokenWires'] | null = null
let lastWiring: WiringPart | null = null

function wiringPart(state: SimState, layout: PointLayout): WiringPart {
  if (state.wires === lastWires && state.brokenWires === lastBroken && layout === lastWiringLayout)
    return lastWiring!
  const part = wiringPartUncached(state, layout)
  lastWiringLayout = layout
  lastWires = state.wires
  lastBroken = state.brokenWires
  lastWiring = part
  return part
}

function wiringPartUncached(state: SimState, layout: PointLayout): WiringPart {
  const { index, wirings } = layout
  const cached = wiringCache.get(state.wires)
  if (cached && cached.broken === state.brokenWires && cached.layout === layout) return cached.part
  const pointCount = index.size
  const codes: number[] = []
  for (const wire of state.wires) {
    if (state.brokenWires.length > 0 && state.brokenWires.includes(wire.id)) continue
    const a = index.get(wire.from)
    const b = index.get(wire.to)
    if (a === undefined || b === undefined) continue
    codes.push(a < b ? a * pointCount + b : b * pointCount + a)
  }
  // Nets do not depend on the order or direction of wires: sorted codes make a canonical identity.
  sortNumbers(codes)
  let hash = codes.length
  for (let i = 0; i < codes.length; i++) hash = (Math.imul(hash, 31) + codes[i]) | 0
  let bucket = wirings.get(hash)
  let part = bucket?.find((p) => sameCodes(p.codes, codes))
  if (part === undefined) {
    const wires = codes.map((c): [number, number] => [Math.floor(c / pointCount), c % pointCount])
    part = { wires, key: wires.map(([a, b]) => `${a}-${b}`).join(','), codes }
    if (wirings.size >= WIRING_LIMIT) wirings.clear()
    if (!bucket) {
      bucket = []
      wirings.set(hash, bucket)
    }
    bucket.push(part)
  }
  wiringCache.set(state.wires, { broken: state.brokenWires, layout, part })
  return part
}

/** Ascending, in place; insertion sort for the few wires of a panel (Array#sort allocates work space). */
function sortNumbers(values: number[]): void {
  if (values.length > 64) {
    values.sort((x, y) => x - y)
    return
  }
  for (let i = 1; i < values.length; i++) {
    const value = values[i]
    let j = i - 1
    while (j >= 0 && values[j] > value) {
      values[j + 1] = values[j]
      j--
    }
    values[j + 1] = value
  }
}

function sameCodes(x: number[], y: number[]): boolean {
  if (x.length !== y.length) return false
  for (let i = 0; i < x.length; i++) if (x[i] !== y[i]) return false
  return true
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
const structureKeys = new WeakMap<WiringPart, Map<number | string, string>>()

/** Contact devices past this many do not fit a small-integer code: their keys fall back to strings. */
const MAX_CODED_CONTACTS = 26

/**
 * Wiring, contacts, sources, logic, relay — everything but potentiometer positions — as one interned
 * string. The lookup goes by a small integer code (no string is built unless the structure is new).
 */
export function structureKey(state: SimState, controlOn: boolean, relayClosed: boolean): string {
  const layout = pointsOf(state)
  const wiring = wiringPart(state, layout)
  const supplyEnabled = controlOn && !state.fuseBlown
  const sink = state.settings.active['inputs.logic'] === 'sink'
  let code: number | string = (+sink | (+supplyEnabled << 1) | (+controlOn << 2) | (+relayClosed << 3)) + 16
  let contacts = 0
  for (const id of state.deviceOrder) {
    const device = state.devices[id]
    if (device.spec.kind === 'potentiometer') continue
    if (contacts++ >= MAX_CODED_CONTACTS) {
      code = ''
      break
    }
    // A 1 marks each contact device (so different device counts never share a code), then its state.
    code = (code as number) * 2 + (contactClosed(device) ? 1 : 0)
  }
  let byLocal = structureKeys.get(wiring)
  if (!byLocal) {
    byLocal = new Map()
    structureKeys.set(wiring, byLocal)
  }
  if (code === '') code = localPart(state, controlOn, relayClosed)
  let structure = byLocal.get(code)
  if (structure === undefined) {
    structure = `${layout.layoutId}|${wiring.key}|${localPart(state, controlOn, relayClosed)}`
    byLocal.set(code, structure)
  }
  return structure
}

function localPart(state: SimState, controlOn: boolean, relayClosed: boolean): string {
  const logic = state.settings.active['inputs.logic']
  const supplyEnabled = controlOn && !state.fuseBlown
  return `${logic === 'sink' ? 'k' : 'o'}${supplyEnabled ? 1 : 0}${controlOn ? 1 : 0}${relayClosed ? 1 : 0}${deviceKeys(state).structure}`
}

/**
 * Potentiometer positions as a memo key: the position itself for one potentiometer (no string built),
 * else the positions joined as in the configuration key.
 */
export function positionsKey(state: SimState): number | string {
  let single: number | undefined
  let count = 0
  for (const id of state.deviceOrder) {
    const device = state.devices[id]
    if (device.spec.kind !== 'potentiometer') continue
    if (count++ === 0) single = device.position
  }
  if (count === 0) return ''
  if (count === 1) return single!
  return deviceKeys(state).positions
}

export function circuitConfig(state: SimState, controlOn: boolean, relayClosed: boolean): CircuitConfig {
  const layout = pointsOf(state)
  const { points, index, terminals } = layout
  const structure = structureKey(state, controlOn, relayClosed)
  const wiring = wiringPart(state, layout)
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
    key: `${structure}#${deviceKeys(state).positions}`,
    structureKey: structure,
  }
}
