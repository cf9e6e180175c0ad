// Builds the control network from the wiring and device states and solves it.
// Nets come from the wires (union-find); the elements between nets split the network into parts that
// meet only at 0 V, and each part is solved on its own and memoised by its own description — so a
// potentiometer turned on the analog input does not re-solve the digital inputs, and vice versa.
import { DIGITAL_INPUT_NUMBERS, type PointId } from '../points'
import { inputRegion, type InputRegion } from './inputThresholds'
import { solveNodal, type ResistiveNetwork } from './nodal'
import { UnionFind } from './unionFind'
import {
  ANALOG_INPUT_OHMS,
  CONTACT_OHMS,
  INPUT_OHMS,
  LEAKAGE_OHMS,
  METER_OHMS,
  OPTO_DROP_VOLTS,
  POT_END_OHMS,
  REFERENCE_LIMIT_AMPS,
  REFERENCE_OHMS,
  REFERENCE_VOLTS,
  SUPPLY_LIMIT_AMPS,
  SUPPLY_OHMS,
  SUPPLY_VOLTS,
} from './constants'

export interface PotentiometerElement {
  hi: number
  wiper: number
  lo: number
  ohms: number
  position: number
}

/** Everything the control network depends on, with points as indices into `points`. */
export interface CircuitConfig {
  points: readonly PointId[]
  pointIndex: ReadonlyMap<PointId, number>
  wires: readonly (readonly [number, number])[]
  /** Identifies the wiring alone (nets depend on nothing else). */
  wiresKey: string
  closedContacts: readonly (readonly [number, number])[]
  potentiometers: readonly PotentiometerElement[]
  logic: 'sink' | 'source'
  /** Electronics on and the fuse intact: the +24 V output is switched on (before any fold-back). */
  supplyEnabled: boolean
  /** Electronics on: the +10 V reference is on (before any fold-back). */
  referenceEnabled: boolean
  /** Identifies the whole configuration (memo key). */
  key: string
  /** The same without potentiometer positions: which parts the network splits into. */
  structureKey: string
}

export interface InputSolution {
  volts: number
  milliamps: number
}

export interface CircuitSolution {
  /** Net index per point. */
  netOfPoint: Int32Array
  netVolts: Float64Array
  groundNet: number
  supplyOverloaded: boolean
  referenceOverloaded: boolean
  supplyOn: boolean
  referenceOn: boolean
  supplyAmps: number
  inputs: InputSolution[]
}

/** Indices of the drive's own points (the order of DRIVE_CONTROL_POINTS). */
export const P = { p24: 0, zero: 1, dcom: 2, di1: 3, p10: 9, ai: 10, acom: 11, k1a: 12, k1b: 13 } as const

export interface Nets {
  netOfPoint: Int32Array
  count: number
  ground: number
}

const netMemo = new Map<string, Nets>()

export function groupNets(config: CircuitConfig): Nets {
  const key = `${config.points.length}|${config.wiresKey}`
  const hit = netMemo.get(key)
  if (hit) return hit
  const uf = new UnionFind(config.points.length)
  uf.union(P.acom, P.zero) // analog common is tied to 0 V inside the drive
  for (const [a, b] of config.wires) uf.union(a, b)
  const netOfPoint = new Int32Array(config.points.length)
  const netOfRoot = new Map<number, number>()
  for (let i = 0; i < config.points.length; i++) {
    const root = uf.find(i)
    let net = netOfRoot.get(root)
    if (net === undefined) {
      net = netOfRoot.size
      netOfRoot.set(root, net)
    }
    netOfPoint[i] = net
  }
  const nets = { netOfPoint, count: netOfRoot.size, ground: netOfPoint[P.zero] }
  if (netMemo.size >= MEMO_LIMIT) netMemo.clear()
  netMemo.set(key, nets)
  return nets
}

/** Network elements between nets (ground included as a net). */
type Element =
  | { kind: 'supply'; net: number }
  | { kind: 'reference'; net: number }
  | { kind: 'resistor'; a: number; b: number; ohms: number }
  | { kind: 'input'; index: number; anode: number; cathode: number }
  /** One half of a potentiometer track; its resistance follows the wiper position. */
  | { kind: 'track'; pot: number; end: 'upper' | 'lower'; a: number; b: number }

/** Sink: current flows from the input terminal into the drive to DIC. Source: from DIC to the input. */
export function inputTerminals(logic: 'sink' | 'source', i: number): [number, number] {
  return logic === 'sink' ? [P.di1 + i, P.dcom] : [P.dcom, P.di1 + i]
}

function elementsOf(config: CircuitConfig, nets: Nets): Element[] {
  const net = (point: number) => nets.netOfPoint[point]
  const elements: Element[] = []
  if (config.supplyEnabled) elements.push({ kind: 'supply', net: net(P.p24) })
  if (config.referenceEnabled) elements.push({ kind: 'reference', net: net(P.p10) })
  elements.push({ kind: 'resistor', a: net(P.ai), b: nets.ground, ohms: ANALOG_INPUT_OHMS })
  DIGITAL_INPUT_NUMBERS.forEach((_, i) => {
    const [anode, cathode] = inputTerminals(config.logic, i)
    elements.push({ kind: 'input', index: i, anode: net(anode), cathode: net(cathode) })
  })
  for (const [a, b] of config.closedContacts)
    elements.push({ kind: 'resistor', a: net(a), b: net(b), ohms: CONTACT_OHMS })
  config.potentiometers.forEach((pot, i) => {
    elements.push({ kind: 'track', pot: i, end: 'upper', a: net(pot.hi), b: net(pot.wiper) })
    elements.push({ kind: 'track', pot: i, end: 'lower', a: net(pot.wiper), b: net(pot.lo) })
  })
  return elements
}

export function trackOhms(pot: PotentiometerElement, end: 'upper' | 'lower'): number {
  return POT_END_OHMS + pot.ohms * (end === 'upper' ? 1 - pot.position : pot.position)
}

function endsOf(e: Element): [number, number] {
  switch (e.kind) {
    case 'supply':
    case 'reference':
      return [e.net, e.net]
    case 'resistor':
    case 'track':
      return [e.a, e.b]
    case 'input':
      return [e.anode, e.cathode]
  }
}

function describe(e: Element): string {
  switch (e.kind) {
    case 'supply':
      return `S${e.net}`
    case 'reference':
      return `R${e.net}`
    case 'resistor':
      return `r${e.a},${e.b},${e.ohms}`
    case 'input':
      return `i${e.index}:${e.anode},${e.cathode}`
    case 'track':
      return `t${e.pot}${e.end}:${e.a},${e.b}`
  }
}

interface PartSolution {
  /** Volts of the part's nets, in the order of `nets`. */
  volts: Float64Array
  nets: number[]
  inputs: { index: number; volts: number; milliamps: number }[]
  supplyOverloaded: boolean
  referenceOverloaded: boolean
  supplyOn: boolean
  referenceOn: boolean
  supplyAmps: number
}

interface Part {
  nets: number[]
  elements: Element[]
}

/** Splits the network into parts that meet only at ground. */
function partsOf(elements: Element[], nets: Nets): Part[] {
  const uf = new UnionFind(nets.count)
  for (const e of elements) {
    const [a, b] = endsOf(e)
    if (a !== nets.ground && b !== nets.ground) uf.union(a, b)
  }
  const partOfRoot = new Map<number, Part>()
  const parts: Part[] = []
  for (let n = 0; n < nets.count; n++) {
    if (n === nets.ground) continue
    const root = uf.find(n)
    let part = partOfRoot.get(root)
    if (!part) {
      part = { nets: [], elements: [] }
      partOfRoot.set(root, part)
      parts.push(part)
    }
    part.nets.push(n)
  }
  for (const e of elements) {
    const [a, b] = endsOf(e)
    const inside = a !== nets.ground ? a : b
    if (inside === nets.ground) continue
    partOfRoot.get(uf.find(inside))!.elements.push(e)
  }
  return parts
}

interface Sources {
  supply: boolean
  reference: boolean
}

function solvePartOnce(
  part: Part,
  ground: number,
  sources: Sources,
  inputOn: Map<number, boolean>,
  pots: readonly PotentiometerElement[],
) {
  const local = new Map<number, number>()
  part.nets.forEach((n, i) => local.set(n, i))
  const node = (n: number) => (n === ground ? -1 : local.get(n)!)
  const network: ResistiveNetwork = { nodeCount: part.nets.length, conductances: [], injections: [] }
  const conduct = (a: number, b: number, ohms: number) => {
    if (a !== b) network.conductances.push({ a, b, siemens: 1 / ohms })
  }
  for (let i = 0; i < part.nets.length; i++) conduct(i, -1, LEAKAGE_OHMS)
  for (const e of part.elements) {
    if (e.kind === 'supply' && sources.supply) {
      conduct(node(e.net), -1, SUPPLY_OHMS)
      network.injections.push({ node: node(e.net), amps: SUPPLY_VOLTS / SUPPLY_OHMS })
    } else if (e.kind === 'reference' && sources.reference) {
      conduct(node(e.net), -1, REFERENCE_OHMS)
      network.injections.push({ node: node(e.net), amps: REFERENCE_VOLTS / REFERENCE_OHMS })
    } else if (e.kind === 'resistor') {
      conduct(node(e.a), node(e.b), e.ohms)
    } else if (e.kind === 'track') {
      conduct(node(e.a), node(e.b), trackOhms(pots[e.pot], e.end))
    } else if (e.kind === 'input' && inputOn.get(e.index) && e.anode !== e.cathode) {
      // Opto LED with series resistance: I(a→k) = (Va − Vk − Vf) / R. Norton form: conductance 1/R in
      // parallel with a source of Vf/R pushing current into the anode and out of the cathode.
      const a = node(e.anode)
      const k = node(e.cathode)
      conduct(a, k, INPUT_OHMS)
      const amps = OPTO_DROP_VOLTS / INPUT_OHMS
      network.injections.push({ node: a, amps }, { node: k, amps: -amps })
    }
  }
  const solution = solveNodal(network)
  return (n: number) => (n === ground ? 0 : solution[local.get(n)!])
}

/** Solves a part with the opto diodes as ideal switches plus drop, iterating until their states agree. */
function solvePartWithDiodes(
  part: Part,
  ground: number,
  sources: Sources,
  pots: readonly PotentiometerElement[],
) {
  const inputOn = new Map<number, boolean>()
  const inputs = part.elements.filter((e): e is Extract<Element, { kind: 'input' }> => e.kind === 'input')
  for (const e of inputs) inputOn.set(e.index, false)
  let voltsOf = solvePartOnce(part, ground, sources, inputOn, pots)
  for (let round = 0; round < 16 && inputs.length > 0; round++) {
    let changed = false
    for (const e of inputs) {
      const across = voltsOf(e.anode) - voltsOf(e.cathode)
      const on = inputOn.get(e.index)!
      if (!on && across > OPTO_DROP_VOLTS + 1e-9) {
        inputOn.set(e.index, true)
        changed = true
      } else if (on && across < OPTO_DROP_VOLTS - 1e-9) {
        inputOn.set(e.index, false)
        changed = true
      }
    }
    if (!changed) break
    voltsOf = solvePartOnce(part, ground, sources, inputOn, pots)
  }
  return { voltsOf, inputs, inputOn }
}

function solvePartFresh(
  part: StructuredPart,
  ground: number,
  pots: readonly PotentiometerElement[],
): PartSolution {
  solveCount++
  const supply = part.elements.find((e) => e.kind === 'supply')
  const reference = part.elements.find((e) => e.kind === 'reference')
  const sources: Sources = { supply: supply !== undefined, reference: reference !== undefined }
  let solved = solvePartWithDiodes(part, ground, sources, pots)
  let supplyOverloaded = false
  let referenceOverloaded = false
  // Fold-back: an output past its current limit switches itself off while the overload lasts.
  if (supply && (SUPPLY_VOLTS - solved.voltsOf(supply.net)) / SUPPLY_OHMS > SUPPLY_LIMIT_AMPS) {
    supplyOverloaded = true
    sources.supply = false
    solved = solvePartWithDiodes(part, ground, sources, pots)
  }
  if (
    reference &&
    (REFERENCE_VOLTS - solved.voltsOf(reference.net)) / REFERENCE_OHMS > REFERENCE_LIMIT_AMPS
  ) {
    referenceOverloaded = true
    sources.reference = false
    solved = solvePartWithDiodes(part, ground, sources, pots)
  }
  return {
    nets: part.nets,
    volts: Float64Array.from(part.nets, (n) => solved.voltsOf(n)),
    inputs: solved.inputs.map((e) => {
      const volts = solved.voltsOf(e.anode) - solved.voltsOf(e.cathode)
      const amps = solved.inputOn.get(e.index) ? (volts - OPTO_DROP_VOLTS) / INPUT_OHMS : 0
      return { index: e.index, volts, milliamps: amps * 1000 }
    }),
    supplyOverloaded,
    referenceOverloaded,
    supplyOn: sources.supply,
    referenceOn: sources.reference,
    supplyAmps: supply && sources.supply ? (SUPPLY_VOLTS - solved.voltsOf(supply.net)) / SUPPLY_OHMS : 0,
  }
}

/** A part's solution, memoised on the part itself (by potentiometer positions when it has any). */
function solvePart(
  part: StructuredPart,
  ground: number,
  pots: readonly PotentiometerElement[],
): PartSolution {
  const cache = part.cache
  if (part.pots.length === 0) return (cache.fixed ??= solvePartFresh(part, ground, pots))
  let key = ''
  for (const i of part.pots) key += `${pots[i].ohms}@${pots[i].position},`
  const byPositions = (cache.byPositions ??= new Map())
  let solution = byPositions.get(key)
  if (!solution) {
    solution = solvePartFresh(part, ground, pots)
    if (byPositions.size >= MEMO_LIMIT) byPositions.clear()
    byPositions.set(key, solution)
  }
  return solution
}

interface StructuredPart extends Part {
  /** Potentiometers with a track in this part. */
  pots: number[]
  hasSupply: boolean
  hasReference: boolean
  /** Solutions shared by every structure that contains an identical part. */
  cache: PartCache
}

interface PartCache {
  fixed?: PartSolution
  byPositions?: Map<string, PartSolution>
}

const partCaches = new Map<string, PartCache>()

function partCacheFor(part: Part, ground: number): PartCache {
  const key = `${ground}|${part.nets.join(',')}|${part.elements.map(describe).join(';')}`
  let cache = partCaches.get(key)
  if (!cache) {
    if (partCaches.size >= MEMO_LIMIT) partCaches.clear()
    cache = {}
    partCaches.set(key, cache)
  }
  return cache
}

interface Structure {
  nets: Nets
  parts: StructuredPart[]
  supplyShorted: boolean
  referenceShorted: boolean
  /** Where the analog input's net is solved: part index and position in it (or -1: at 0 V). */
  analogPart: number
  analogAt: number
  summaries: Map<number | string, DriveCircuitSummary>
}

const structureMemo = new Map<string, Structure>()

/** Nets and parts for a configuration: they do not depend on potentiometer positions. */
function structureOf(config: CircuitConfig): Structure {
  const hit = structureMemo.get(config.structureKey)
  if (hit) return hit
  const nets = groupNets(config)
  const parts = partsOf(elementsOf(config, nets), nets)
    .filter((part) => part.elements.length > 0) // a floating net alone: leakage holds it at 0 V
    .map((part) => ({
      ...part,
      pots: [...new Set(part.elements.flatMap((e) => (e.kind === 'track' ? [e.pot] : [])))],
      hasSupply: part.elements.some((e) => e.kind === 'supply'),
      hasReference: part.elements.some((e) => e.kind === 'reference'),
      cache: partCacheFor(part, nets.ground),
    }))
  const analogNet = nets.netOfPoint[P.ai]
  const analogPart = parts.findIndex((part) => part.nets.includes(analogNet))
  const structure: Structure = {
    nets,
    parts,
    analogPart,
    analogAt: analogPart < 0 ? -1 : parts[analogPart].nets.indexOf(analogNet),
    summaries: new Map(),
    // An output wired straight to 0 V is a dead short: past its limit at once.
    supplyShorted: config.supplyEnabled && nets.netOfPoint[P.p24] === nets.ground,
    referenceShorted: config.referenceEnabled && nets.netOfPoint[P.p10] === nets.ground,
  }
  if (structureMemo.size >= MEMO_LIMIT) structureMemo.clear()
  structureMemo.set(config.structureKey, structure)
  return structure
}

function solveUncached(config: CircuitConfig): CircuitSolution {
  const { nets, parts, supplyShorted, referenceShorted } = structureOf(config)
  const netVolts = new Float64Array(nets.count)
  const inputs: InputSolution[] = DIGITAL_INPUT_NUMBERS.map(() => ({ volts: 0, milliamps: 0 }))
  const solution: CircuitSolution = {
    netOfPoint: nets.netOfPoint,
    netVolts,
    groundNet: nets.ground,
    supplyOverloaded: supplyShorted,
    referenceOverloaded: referenceShorted,
    supplyOn: false,
    referenceOn: false,
    supplyAmps: 0,
    inputs,
  }
  for (const part of parts) {
    const solved = solvePart(part, nets.ground, config.potentiometers)
    for (let i = 0; i < solved.nets.length; i++) netVolts[solved.nets[i]] = solved.volts[i]
    for (const input of solved.inputs)
      inputs[input.index] = { volts: input.volts, milliamps: input.milliamps }
    if (part.hasSupply) {
      solution.supplyOverloaded = solved.supplyOverloaded
      solution.supplyOn = solved.supplyOn
      solution.supplyAmps = solved.supplyAmps
    }
    if (part.hasReference) {
      solution.referenceOverloaded = solved.referenceOverloaded
      solution.referenceOn = solved.referenceOn
    }
  }
  return solution
}

/** What the drive logic needs from the network: input voltages and currents, analog volts, overloads. */
export interface DriveCircuitSummary {
  inputs: InputSolution[]
  regions: InputRegion[]
  analogVolts: number
  supplyOverloaded: boolean
  referenceOverloaded: boolean
  /** The state's circuit summary for this configuration (one shared object per configuration). */
  circuit: {
    key: string
    analogVolts: number
    supplyOverloaded: boolean
    referenceOverloaded: boolean
    relayClosed: boolean
  }
}

const NO_INPUT: InputSolution = { volts: 0, milliamps: 0 }

/** The memoised summary for a structure key and potentiometer positions key, if solved before. */
export function cachedDriveSummary(
  structureKey: string,
  positionsKey: number | string,
): DriveCircuitSummary | undefined {
  return structureMemo.get(structureKey)?.summaries.get(positionsKey)
}

/** The network as the drive sees it, solved (parts memoised) and kept per structure and wiper positions. */
export function solveForDrive(
  config: CircuitConfig,
  positionsKey: number | string,
  relayClosed: boolean,
): DriveCircuitSummary {
  const structure = structureOf(config)
  const summaries = structure.summaries
  const hit = summaries.get(positionsKey)
  if (hit) return hit
  const inputs: InputSolution[] = [NO_INPUT, NO_INPUT, NO_INPUT, NO_INPUT, NO_INPUT, NO_INPUT]
  let supplyOverloaded = structure.supplyShorted
  let referenceOverloaded = structure.referenceShorted
  let analogVolts = 0
  for (let p = 0; p < structure.parts.length; p++) {
    const part = structure.parts[p]
    const solved = solvePart(part, structure.nets.ground, config.potentiometers)
    for (const input of solved.inputs) inputs[input.index] = input
    if (part.hasSupply) supplyOverloaded = solved.supplyOverloaded
    if (part.hasReference) referenceOverloaded = solved.referenceOverloaded
    if (p === structure.analogPart) analogVolts = solved.volts[structure.analogAt]
  }
  const summary: DriveCircuitSummary = {
    inputs,
    regions: inputs.map((i) => inputRegion(i.volts, i.milliamps)),
    analogVolts,
    supplyOverloaded,
    referenceOverloaded,
    circuit: { key: config.key, analogVolts, supplyOverloaded, referenceOverloaded, relayClosed },
  }
  if (summaries.size >= MEMO_LIMIT) summaries.clear()
  summaries.set(positionsKey, summary)
  return summary
}

const MEMO_LIMIT = 16_384
const solutions = new Map<string, CircuitSolution>()
const meterSolutions = new Map<string, { volts: number; floating: boolean }>()
let solveCount = 0

/** The solution for a configuration; equal configurations (and equal parts) share one solve. */
export function solveCircuit(config: CircuitConfig): CircuitSolution {
  const hit = solutions.get(config.key)
  if (hit) return hit
  if (solutions.size >= MEMO_LIMIT) solutions.clear()
  const solution = solveUncached(config)
  solutions.set(config.key, solution)
  return solution
}

/**
 * What a 10 MΩ meter reads between two control points, solved with the meter in the whole network.
 * Input states come from the network without the meter: its load (≤ 3 µA) cannot move an input
 * across the IEC 61131-2 limits, so the drive logic never needs this solve.
 */
export function solveMeter(
  config: CircuitConfig,
  red: number,
  black: number,
): { volts: number; floating: boolean } {
  const key = `${config.key}|m${red},${black}`
  const hit = meterSolutions.get(key)
  if (hit) return hit
  if (meterSolutions.size >= MEMO_LIMIT) meterSolutions.clear()
  const base = solveCircuit(config)
  const nets = groupNets(config)
  const elements = elementsOf(config, nets).filter(
    (e) => (e.kind !== 'supply' || base.supplyOn) && (e.kind !== 'reference' || base.referenceOn),
  )
  const a = nets.netOfPoint[red]
  const b = nets.netOfPoint[black]
  elements.push({ kind: 'resistor', a, b, ohms: METER_OHMS })
  const whole: Part = { nets: [], elements }
  for (let n = 0; n < nets.count; n++) if (n !== nets.ground) whole.nets.push(n)
  const sources = { supply: base.supplyOn, reference: base.referenceOn }
  const { voltsOf } = solvePartWithDiodes(whole, nets.ground, sources, config.potentiometers)
  const result = { volts: voltsOf(a) - voltsOf(b), floating: !connected(config, nets, red, black) }
  meterSolutions.set(key, result)
  return result
}

/** Whether two points are joined by anything that conducts (leakage and the meter aside). */
function connected(config: CircuitConfig, nets: Nets, a: number, b: number): boolean {
  const uf = new UnionFind(nets.count)
  const join = (p: number, q: number) => uf.union(nets.netOfPoint[p], nets.netOfPoint[q])
  for (const [p, q] of config.closedContacts) join(p, q)
  for (const pot of config.potentiometers) {
    join(pot.hi, pot.wiper)
    join(pot.wiper, pot.lo)
  }
  // Inside the drive every control terminal is referenced to 0 V (supply, inputs, analog input);
  // the relay contact (K1A, K1B, the last two drive points) is potential-free.
  for (let p = 0; p < P.k1a; p++) join(p, P.zero)
  return uf.find(nets.netOfPoint[a]) === uf.find(nets.netOfPoint[b])
}

/** Number of part solves so far (for the benchmark's memo statistics). */
export function circuitSolveCount(): number {
  return solveCount
}

export function clearCircuitMemo(): void {
  solutions.clear()
  meterSolutions.clear()
  netMemo.clear()
  partCaches.clear()
  structureMemo.clear()
}
