// What an ohmmeter reads between two control points: the network with every source off (de-energised),
// solved by injecting a test current. Memoised per configuration and probe pair.
import { CONTACT_OHMS, ANALOG_INPUT_OHMS, INPUT_OHMS_AT_24V } from './constants'
import { groupNets, inputTerminals, P, trackOhms, type CircuitConfig } from './controlCircuit'
import { solveNodal } from './nodal'
import { UnionFind } from './unionFind'

interface Resistor {
  a: number
  b: number
  ohms: number
}

/** Passive elements between nets: closed contacts, potentiometer tracks, the inputs, the analog input. */
function passiveElements(config: CircuitConfig): {
  resistors: Resistor[]
  netCount: number
  netOf: Int32Array
} {
  const nets = groupNets(config)
  const net = (point: number) => nets.netOfPoint[point]
  const resistors: Resistor[] = []
  for (const [a, b] of config.closedContacts) resistors.push({ a: net(a), b: net(b), ohms: CONTACT_OHMS })
  for (const pot of config.potentiometers) {
    resistors.push({ a: net(pot.hi), b: net(pot.wiper), ohms: trackOhms(pot, 'upper') })
    resistors.push({ a: net(pot.wiper), b: net(pot.lo), ohms: trackOhms(pot, 'lower') })
  }
  for (let i = 0; i < 6; i++) {
    const [anode, cathode] = inputTerminals(config.logic, i)
    resistors.push({ a: net(anode), b: net(cathode), ohms: INPUT_OHMS_AT_24V })
  }
  resistors.push({ a: net(P.ai), b: nets.ground, ohms: ANALOG_INPUT_OHMS })
  return { resistors: resistors.filter((r) => r.a !== r.b), netCount: nets.count, netOf: nets.netOfPoint }
}

/** Resistance between two nodes of a resistor network (null: no path), by nodal analysis with 1 A injected. */
export function networkResistance(
  nodeCount: number,
  resistors: readonly Resistor[],
  from: number,
  to: number,
): number | null {
  if (from === to) return 0
  const uf = new UnionFind(nodeCount)
  for (const r of resistors) uf.union(r.a, r.b)
  if (uf.find(from) !== uf.find(to)) return null
  // Only the nodes joined to the probes take part; `to` is the reference.
  const root = uf.find(from)
  const local = new Map<number, number>()
  for (let n = 0; n < nodeCount; n++) if (n !== to && uf.find(n) === root) local.set(n, local.size)
  const node = (n: number) => (n === to ? -1 : local.get(n)!)
  const conductances = resistors
    .filter((r) => uf.find(r.a) === root)
    .map((r) => ({ a: node(r.a), b: node(r.b), siemens: 1 / r.ohms }))
  const volts = solveNodal({
    nodeCount: local.size,
    conductances,
    injections: [{ node: node(from), amps: 1 }],
  })
  return volts[node(from)]
}

const MEMO_LIMIT = 16_384
const memo = new Map<string, number | null>()

/** Ohms between two control points with the control circuit de-energised; null when no path joins them. */
export function controlResistance(config: CircuitConfig, red: number, black: number): number | null {
  const key = `${config.key}|${red},${black}`
  const hit = memo.get(key)
  if (hit !== undefined) return hit
  const { resistors, netCount, netOf } = passiveElements(config)
  const ohms = networkResistance(netCount, resistors, netOf[red], netOf[black])
  if (memo.size >= MEMO_LIMIT) memo.clear()
  memo.set(key, ohms)
  return ohms
}

export function clearResistanceMemo(): void {
  memo.clear()
}
