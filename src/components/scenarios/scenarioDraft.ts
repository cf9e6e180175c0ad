// The scenario editor's working copy: the whole scenario document in one object, as the forms edit it,
// checked live by the shared checkScenario. Also the words the forms use for the document's own parts
// (wires, devices, faults, hints), so no id, key or enum value reaches the screen.
import { DEVICE_TERMINALS, POINT_LABELS, type SimState } from '@shared/model'
import { checkScenario, type Scenario, type ScenarioProblem } from '@shared/scenario'
import { faultName, pointName, wireNumber } from '@shared/scenario/names'
import type { ScenarioDevice, ScenarioFault, ScenarioWire } from '@shared/scenario/schema'
import { wireColourMarking } from '@shared/schematic/markings'

/**
 * The document as the editor holds it: shaped like a scenario (the forms write the right types), though
 * fields may still be empty or wrong while the author works (checkScenario says what).
 */
export type EditorDocument = Scenario

type Doc = Record<string, unknown>

/** A blank start for a brand-new scenario. */
export function blankDocument(): Doc {
  return {
    title: '',
    site: { name: '', machine: '', people: [] },
    story: '',
    learningOutcomes: [],
    difficulty: 'introductory',
    estimatedMinutes: 20,
    start: { devices: [], wires: [], settings: {}, power: { on: false, locked: false } },
    faults: [],
    hints: [],
    safetyNotes: [],
    objectives: [],
    passMark: 0,
  }
}

const obj = (v: unknown): Doc => (v && typeof v === 'object' && !Array.isArray(v) ? (v as Doc) : {})
const arr = (v: unknown): unknown[] => (Array.isArray(v) ? v : [])

/**
 * A draft's document made safe for the forms: every list and part present (a draft may have been saved
 * half-written), its key and version set. Parts the forms do not edit are kept as they are.
 */
export function editorDocument(doc: Doc, key: string, version: number): EditorDocument {
  const blank = blankDocument()
  const start = obj(doc.start)
  const power = obj(start.power)
  return {
    ...blank,
    ...doc,
    id: key,
    version,
    site: { ...obj(blank.site), ...obj(doc.site), people: arr(obj(doc.site).people) },
    learningOutcomes: arr(doc.learningOutcomes),
    safetyNotes: arr(doc.safetyNotes),
    start: {
      ...start,
      devices: arr(start.devices),
      wires: arr(start.wires),
      settings: obj(start.settings),
      power: { on: power.on === true, locked: power.locked === true, ...power },
    },
    faults: arr(doc.faults),
    hints: arr(doc.hints),
    objectives: arr(doc.objectives),
  } as unknown as EditorDocument
}

/** The document to save: text lists without blank lines (the forms keep them while typing). */
export function documentToSave(doc: EditorDocument): Doc {
  const copy = JSON.parse(JSON.stringify(doc)) as EditorDocument
  const clean = (list: string[]) => list.map((l) => l.trim()).filter(Boolean)
  copy.learningOutcomes = clean(copy.learningOutcomes)
  copy.safetyNotes = clean(copy.safetyNotes)
  copy.site.people = clean(copy.site.people)
  return copy as unknown as Doc
}

export interface DraftCheck {
  /** The checked scenario, only when there is no problem. */
  scenario: Scenario | null
  problems: ScenarioProblem[]
}

export function checkDraft(doc: EditorDocument): DraftCheck {
  const check = checkScenario(documentToSave(doc))
  return check.ok ? { scenario: check.scenario, problems: [] } : { scenario: null, problems: check.problems }
}

/** A URL-safe key from a title: "Night shift pump" → "night-shift-pump". */
export function keyFromTitle(title: string): string {
  return title
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 60)
    .replace(/-+$/, '')
}

const RESERVED = new Set(['drive', 'meter', 'motor', 'prover'])

/** An id made from a label, unique among `taken` (never shown: the form names things by their label). */
export function idFromLabel(label: string, taken: Iterable<string>, fallback = 'item'): string {
  const words = label
    .normalize('NFKD')
    .replace(/[^A-Za-z0-9]+/g, ' ')
    .trim()
    .split(' ')
    .filter(Boolean)
  let base = words
    .map((w, i) => (i === 0 ? w.toLowerCase() : w[0]!.toUpperCase() + w.slice(1).toLowerCase()))
    .join('')
  if (!/^[a-zA-Z]/.test(base)) base = `${fallback}${base}`
  if (RESERVED.has(base)) base = `${base}Device`
  const used = new Set(taken)
  if (!used.has(base)) return base
  for (let n = 2; ; n++) if (!used.has(`${base}${n}`)) return `${base}${n}`
}

/** The next free id of the form `<prefix><n>`. */
export function nextId(prefix: string, taken: Iterable<string>): string {
  const used = new Set(taken)
  for (let n = 1; ; n++) if (!used.has(`${prefix}${n}`)) return `${prefix}${n}`
}

// ---- Words for the document's own parts ----

/** A stand-in for the simulator state the naming functions read (only the devices are needed). */
export function namingState(doc: EditorDocument): SimState {
  const devices = Object.fromEntries(doc.start.devices.map((d) => [d.id, { spec: d }]))
  return { devices, wires: doc.start.wires } as unknown as SimState
}

export const DEVICE_KIND_WORDS: Record<ScenarioDevice['kind'], string> = {
  pushbutton: 'Push button',
  selector: 'Selector switch',
  potentiometer: 'Potentiometer',
}

export function deviceWords(device: ScenarioDevice): string {
  return device.label.trim() || `${DEVICE_KIND_WORDS[device.kind]} without a label`
}

/** "W3 (blue) from DI1 to Start terminal 14". */
export function wireWords(doc: EditorDocument, wire: ScenarioWire, index: number): string {
  const state = namingState(doc)
  return `${wireNumber(wire.id, index)} (${wireColourMarking(wire.colour).name.toLowerCase()}) from ${pointName(wire.from, state)} to ${pointName(wire.to, state)}`
}

export function faultWords(doc: EditorDocument, fault: ScenarioFault): string {
  const incomplete =
    ('wireId' in fault && !fault.wireId) ||
    ('device' in fault && !fault.device) ||
    ('key' in fault && !fault.key) ||
    ('conductor' in fault && !fault.conductor) ||
    ('input' in fault && !fault.input)
  if (incomplete) return `${FAULT_KIND_WORDS[fault.kind]} (still to choose what)`
  const words = faultName(fault, namingState(doc)).replace(/^the /, '')
  return words[0]!.toUpperCase() + words.slice(1)
}

export const FAULT_KIND_WORDS: Record<ScenarioFault['kind'], string> = {
  brokenWire: 'A wire broken inside its insulation',
  contactFailedOpen: 'A contact that no longer closes',
  contactWelded: 'A contact welded shut',
  wrongContactType: 'The wrong contact block fitted',
  blownFuse: 'The control fuse blown',
  motorConductorOpen: 'A motor-cable conductor broken',
  inputUnresponsive: 'A drive input that stopped responding',
  settingChanged: 'A setting changed behind the apprentice’s back',
}

/** Drive terminals an input condition can look at, in words. */
const DRIVE_INPUT_CHOICES = (
  ['drive.di1', 'drive.di2', 'drive.di3', 'drive.di4', 'drive.di5', 'drive.di6', 'drive.ai'] as const
).map((value) => ({ value, title: `Terminal ${POINT_LABELS[value]}` }))

/**
 * Terminals a wiring objective may look at: the drive's inputs, then every terminal of the scenario's own
 * devices, named as the panel labels them ("Fan run / stop terminal 14", "Stirrer speed wiper (W)").
 */
export function controlPointChoices(doc: EditorDocument): { value: string; title: string }[] {
  const state = namingState(doc)
  const deviceTerminals = doc.start.devices.flatMap((device) =>
    DEVICE_TERMINALS[device.kind].map((terminal) => {
      const value = `${device.id}.${terminal}`
      return { value, title: pointName(value, state) }
    }),
  )
  return [...DRIVE_INPUT_CHOICES, ...deviceTerminals]
}

/** What in the document refers to a device, in words (for the confirmation before removing it). */
export function deviceUses(doc: EditorDocument, deviceId: string): string[] {
  const uses: string[] = []
  doc.start.wires.forEach((w, i) => {
    if (w.from.startsWith(`${deviceId}.`) || w.to.startsWith(`${deviceId}.`))
      uses.push(`wire ${wireNumber(w.id, i)}`)
  })
  doc.faults.forEach((f, i) => {
    if ('device' in f && f.device === deviceId) uses.push(`fault ${i + 1}`)
  })
  doc.objectives.forEach((o, i) => {
    if (JSON.stringify(o).includes(`"${deviceId}`)) uses.push(`objective ${i + 1}`)
  })
  return uses
}

/**
 * Starting wires landed on terminals of `device` that a device of `kind` does not have, in words (a
 * selector has a contact, a potentiometer two ends and a wiper).
 */
export function wiresLeftWithoutTerminal(
  doc: EditorDocument,
  device: ScenarioDevice,
  kind: ScenarioDevice['kind'],
): string[] {
  const kept = new Set(DEVICE_TERMINALS[kind])
  const prefix = `${device.id}.`
  const lost = (point: string) => point.startsWith(prefix) && !kept.has(point.slice(prefix.length))
  return doc.start.wires.flatMap((w, i) => (lost(w.from) || lost(w.to) ? [wireWords(doc, w, i)] : []))
}

// ---- The machine's name: the story's (what the apprentice reads) and the starting state's ----

/** An empty machine part is left out, as the shipped scenarios do. */
export function pruneMachine(doc: EditorDocument): void {
  if (doc.start.machine && Object.keys(doc.start.machine).length === 0) delete doc.start.machine
}

export function setMachineName(doc: EditorDocument, name: string): void {
  if (name.trim()) (doc.start.machine ??= {}).name = name
  else if (doc.start.machine) {
    delete doc.start.machine.name
    pruneMachine(doc)
  }
}

/**
 * The machine as the story names it. The starting state's machine name follows it while the two are
 * the same (or both still empty); once the author gives the name its own wording, it stays.
 */
export function setSiteMachine(doc: EditorDocument, machine: string): void {
  const before = doc.site.machine
  const name = doc.start.machine?.name
  doc.site.machine = machine
  if (name === before || (name === undefined && !before.trim())) setMachineName(doc, machine)
}

/** What refers to a fault (objectives point at faults by their place in the list). */
export function faultUses(doc: EditorDocument, index: number): string[] {
  return doc.objectives.flatMap((o, i) => ('fault' in o && o.fault === index ? [`objective ${i + 1}`] : []))
}

export function hintUses(doc: EditorDocument, hintId: string): string[] {
  return doc.objectives.flatMap((o, i) => (o.hints?.includes(hintId) ? [`objective ${i + 1}`] : []))
}

/** After removing fault `index`, objectives pointing at later faults move down one. */
export function renumberFaultsAfterRemoval(doc: EditorDocument, index: number): void {
  for (const o of doc.objectives) {
    if ('fault' in o && typeof o.fault === 'number' && o.fault > index) o.fault -= 1
    else if ('fault' in o && o.fault === index) delete (o as { fault?: number }).fault
  }
}

/** After moving a fault from `from` to `to`, objectives follow it. */
export function renumberFaultsAfterMove(doc: EditorDocument, from: number, to: number): void {
  for (const o of doc.objectives) {
    if (!('fault' in o) || typeof o.fault !== 'number') continue
    if (o.fault === from) o.fault = to
    else if (o.fault === to) o.fault = from
  }
}
