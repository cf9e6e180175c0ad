// What changed between two scenario documents, in words an instructor reads: "Wire W3 added from DI1 to
// Fan run / stop terminal 14", "Objective “Stop by ramp”: points 10 → 15". Either document may be a
// published version or a draft (possibly incomplete), so every field is read defensively. No internal id,
// key, enum value or JSON path reaches the words: things are named as the panel and the editor name them.
import { DEFAULT_SETTINGS, isSettingKey, settingDef, type SimState } from '../model'
import { DIAGNOSIS_FINDING_SHORT, type DiagnosisFinding, type DiagnosisTarget } from '../model/diagnosis'
import { contactWords, wireColourMarking } from '../schematic/markings'
import { objectiveKindLabel } from './kindLabels'
import {
  deviceName,
  diagnosisTargetName,
  faultName,
  inputFunctionName,
  pairName,
  pointName,
  settingName,
  settingValueName,
  wireName,
} from './names'
import { OBJECTIVE_KINDS, type ObjectiveKind } from './objectiveSchema'
import type { ScenarioFault } from './schema'

/** The sections a comparison is grouped by, in the order a page shows them. */
export const CHANGE_SECTIONS = ['The exercise', 'Starting state', 'Faults', 'Hints', 'Objectives'] as const
export type ChangeSection = (typeof CHANGE_SECTIONS)[number]

export interface ScenarioChange {
  section: ChangeSection
  text: string
}

type Doc = Record<string, unknown>
type Item = Record<string, unknown>

const asDoc = (value: unknown): Doc =>
  value && typeof value === 'object' && !Array.isArray(value) ? (value as Doc) : {}
const asItems = (value: unknown): Item[] =>
  Array.isArray(value) ? value.filter((v): v is Item => Boolean(v) && typeof v === 'object') : []
const asStrings = (value: unknown): string[] =>
  Array.isArray(value) ? value.filter((v): v is string => typeof v === 'string') : []
const same = (a: unknown, b: unknown) => JSON.stringify(a) === JSON.stringify(b)

function quote(text: unknown, max = 80): string {
  if (typeof text !== 'string' || !text.trim()) return 'nothing'
  const t = text.trim().replace(/\s+/g, ' ')
  return `“${t.length > max ? `${t.slice(0, max - 1)}…` : t}”`
}

const DIFFICULTY_WORDS: Record<string, string> = {
  introductory: 'introductory',
  intermediate: 'intermediate',
  advanced: 'advanced',
}
const DEVICE_KIND_WORDS: Record<string, string> = {
  pushbutton: 'push-button',
  selector: 'selector switch',
  potentiometer: 'potentiometer',
}

/** A stand-in for the simulation state, enough for names.ts to name devices, terminals and wires. */
function namingState(doc: Doc): SimState {
  const start = asDoc(doc.start)
  const devices: Record<string, { spec: Item }> = {}
  for (const d of asItems(start.devices)) if (typeof d.id === 'string') devices[d.id] = { spec: d }
  return { devices, wires: asItems(start.wires) } as unknown as SimState
}

const yesNo = (v: unknown) => (v === true ? 'yes' : 'no')
const numberWords = (v: unknown, unit = '') =>
  typeof v === 'number' ? `${v}${unit ? ` ${unit}` : ''}` : 'not set'
const points = (v: unknown) => (typeof v === 'number' ? `${v} point${v === 1 ? '' : 's'}` : 'not set')

// ---- The exercise -------------------------------------------------------------------------------

function textLists(label: string, before: unknown, after: unknown): string[] {
  const was = asStrings(before)
  const now = asStrings(after)
  return [
    ...now.filter((t) => !was.includes(t)).map((t) => `${label} added: ${quote(t)}`),
    ...was.filter((t) => !now.includes(t)).map((t) => `${label} removed: ${quote(t)}`),
  ]
}

function exerciseChanges(a: Doc, b: Doc): string[] {
  const out: string[] = []
  const field = (label: string, x: unknown, y: unknown, words: (v: unknown) => string) => {
    if (!same(x, y)) out.push(`${label}: ${words(x)} → ${words(y)}`)
  }
  field('Title', a.title, b.title, (v) => quote(v))
  if (!same(a.story, b.story)) out.push(`Story rewritten: now begins ${quote(b.story, 60)}`)
  field('Difficulty', a.difficulty, b.difficulty, (v) =>
    typeof v === 'string' ? (DIFFICULTY_WORDS[v] ?? 'not one the library offers') : 'not set',
  )
  field('Estimated time', a.estimatedMinutes, b.estimatedMinutes, (v) => numberWords(v, 'min'))
  field('Pass mark', a.passMark, b.passMark, points)
  const siteA = asDoc(a.site)
  const siteB = asDoc(b.site)
  field('Site', siteA.name, siteB.name, (v) => quote(v))
  field('Machine', siteA.machine, siteB.machine, (v) => quote(v))
  out.push(...textLists('Person in the story', siteA.people, siteB.people))
  out.push(...textLists('Learning outcome', a.learningOutcomes, b.learningOutcomes))
  out.push(...textLists('Safety note', a.safetyNotes, b.safetyNotes))
  return out
}

// ---- Starting state -----------------------------------------------------------------------------

function deviceWords(d: Item): string {
  const kind = DEVICE_KIND_WORDS[String(d.kind)] ?? 'device'
  const contact =
    d.kind === 'potentiometer' ? '' : `, ${contactWords(d.contact === 'NC' ? 'NC' : 'NO')} contact`
  return `${quote(d.label)} (${kind}${contact})`
}

function byId(items: Item[]): Map<string, Item> {
  return new Map(items.filter((i) => typeof i.id === 'string').map((i) => [i.id as string, i]))
}

function deviceChanges(a: Doc, b: Doc, stateB: SimState): string[] {
  const was = byId(asItems(asDoc(a.start).devices))
  const now = byId(asItems(asDoc(b.start).devices))
  const out: string[] = []
  for (const [id, d] of now) {
    const old = was.get(id)
    if (!old) {
      out.push(`Device added: ${deviceWords(d)}`)
      continue
    }
    if (same(old, d)) continue
    const name = deviceName(id, stateB)
    if (!same(old.label, d.label)) out.push(`Device ${quote(old.label)} renamed ${quote(d.label)}`)
    if (!same(old.kind, d.kind) || !same(old.contact, d.contact))
      out.push(`Device ${quote(name)}: ${deviceWords(old)} → ${deviceWords(d)}`)
    if (!same(old.position, d.position))
      out.push(
        `Device ${quote(name)}: starting position ${positionWords(d.kind, old.position)} → ${positionWords(d.kind, d.position)}`,
      )
    if (!same(old.ohms, d.ohms))
      out.push(`Device ${quote(name)}: ${numberWords(old.ohms, 'Ω')} → ${numberWords(d.ohms, 'Ω')}`)
  }
  for (const [id, d] of was) if (!now.has(id)) out.push(`Device removed: ${deviceWords(d)}`)
  return out
}

function positionWords(kind: unknown, position: unknown): string {
  if (typeof position !== 'number') return 'as made'
  if (kind === 'selector') return position === 1 ? 'switched on' : 'switched off'
  return `${Math.round(position * 100)} % of its travel`
}

function wireRun(w: Item, state: SimState): string {
  const from = pointName(typeof w.from === 'string' ? w.from : null, state)
  const to = pointName(typeof w.to === 'string' ? w.to : null, state)
  return `from ${from} to ${to} (${wireColourMarking(String(w.colour)).name.toLowerCase()})`
}

function wireChanges(a: Doc, b: Doc, stateA: SimState, stateB: SimState): string[] {
  const was = byId(asItems(asDoc(a.start).wires))
  const now = byId(asItems(asDoc(b.start).wires))
  const out: string[] = []
  const label = (id: string, state: SimState) => `Wire ${wireName(id, state, true) ?? ''}`.trim()
  for (const [id, w] of now) {
    const old = was.get(id)
    if (!old) out.push(`${label(id, stateB)} added ${wireRun(w, stateB)}`)
    else if (!same(old, w))
      out.push(`${label(id, stateB)} now runs ${wireRun(w, stateB)}; it ran ${wireRun(old, stateA)}`)
  }
  for (const [id, w] of was)
    if (!now.has(id)) out.push(`${label(id, stateA)} removed; it ran ${wireRun(w, stateA)}`)
  return out
}

function settingChanges(a: Doc, b: Doc): string[] {
  const was = asDoc(asDoc(a.start).settings)
  const now = asDoc(asDoc(b.start).settings)
  const out: string[] = []
  for (const key of new Set([...Object.keys(was), ...Object.keys(now)])) {
    if (same(was[key], now[key])) continue
    const fallback = isSettingKey(key) ? DEFAULT_SETTINGS[key] : undefined
    const words = (v: unknown) =>
      v === undefined
        ? `${fallback === undefined ? 'not set' : settingValueName(key, fallback)} (its default)`
        : settingValueName(key, v)
    out.push(`Starting setting ${settingName(key)}: ${words(was[key])} → ${words(now[key])}`)
  }
  return out
}

function powerChanges(a: Doc, b: Doc): string[] {
  const was = asDoc(asDoc(a.start).power)
  const now = asDoc(asDoc(b.start).power)
  const out: string[] = []
  if (!same(was.on, now.on))
    out.push(`Power at the start: ${was.on ? 'on' : 'off'} → ${now.on ? 'on' : 'off'}`)
  if (!same(was.locked, now.locked))
    out.push(
      `The apprentice’s own lock at the start: ${was.locked ? 'on' : 'off'} → ${now.locked ? 'on' : 'off'}`,
    )
  const lockWords = (lock: unknown) => {
    const name = asDoc(lock).name
    return typeof name === 'string' ? `${quote(name)}’s lock` : 'none'
  }
  if (!same(was.supervisorLock, now.supervisorLock))
    out.push(
      `Supervisor’s lock at the start: ${lockWords(was.supervisorLock)} → ${lockWords(now.supervisorLock)}`,
    )
  return out
}

function machineChanges(a: Doc, b: Doc): string[] {
  const was = asDoc(a.start)
  const now = asDoc(b.start)
  const out: string[] = []
  if (!same(was.lineVolts, now.lineVolts))
    out.push(
      `Incoming supply: ${numberWords(was.lineVolts ?? 400, 'V')} → ${numberWords(now.lineVolts ?? 400, 'V')}`,
    )
  if (!same(was.motor, now.motor)) out.push('Motor nameplate changed')
  const { name: nameWas, ...loadWas } = asDoc(was.machine)
  const { name: nameNow, ...loadNow } = asDoc(now.machine)
  if (!same(nameWas, nameNow)) out.push(`Machine's name: ${quote(nameWas)} → ${quote(nameNow)}`)
  if (!same(loadWas, loadNow)) out.push('Driven machine changed (its load or how it slows down)')
  if (!same(was.motorCable, now.motorCable)) out.push('How the motor cable is landed at the start changed')
  return out
}

// ---- Faults and hints ---------------------------------------------------------------------------

function faultWords(fault: Item, state: SimState): string {
  try {
    // A kind names.ts does not know falls through its switch (a draft may hold anything).
    return faultName(fault as unknown as ScenarioFault, state) ?? UNKNOWN_FAULT
  } catch {
    return UNKNOWN_FAULT
  }
}
const UNKNOWN_FAULT = 'a fault of a kind the simulator does not have'

function faultChanges(a: Doc, b: Doc, stateA: SimState, stateB: SimState): string[] {
  const was = asItems(a.faults)
  const now = asItems(b.faults)
  const key = (f: Item) => JSON.stringify(f)
  const wasKeys = was.map(key)
  const nowKeys = now.map(key)
  return [
    ...now.filter((f) => !wasKeys.includes(key(f))).map((f) => `Fault added: ${faultWords(f, stateB)}`),
    ...was.filter((f) => !nowKeys.includes(key(f))).map((f) => `Fault removed: ${faultWords(f, stateA)}`),
  ]
}

function hintChanges(a: Doc, b: Doc): string[] {
  const was = byId(asItems(a.hints))
  const now = byId(asItems(b.hints))
  const out: string[] = []
  for (const [id, h] of now) {
    const old = was.get(id)
    if (!old) out.push(`Hint added: ${quote(h.text)} (costs ${points(h.cost)})`)
    else {
      if (!same(old.text, h.text)) out.push(`Hint ${quote(old.text, 40)} reworded: ${quote(h.text)}`)
      if (!same(old.cost, h.cost))
        out.push(`Hint ${quote(h.text, 40)}: costs ${points(old.cost)} → ${points(h.cost)}`)
    }
  }
  for (const [id, h] of was) if (!now.has(id)) out.push(`Hint removed: ${quote(h.text)}`)
  return out
}

// ---- Objectives ---------------------------------------------------------------------------------

const kindWords = (kind: unknown) =>
  (OBJECTIVE_KINDS as readonly string[]).includes(String(kind))
    ? objectiveKindLabel(kind as ObjectiveKind).toLowerCase()
    : 'a kind the grader does not have'

/** What an objective's own fields say, each in words, against the document it belongs to. */
function objectiveFieldWords(o: Item, doc: Doc, state: SimState): Record<string, string> {
  const key = typeof o.key === 'string' ? o.key : ''
  const unit = isSettingKey(key)
    ? (() => {
        const d = settingDef(key)
        return d.kind === 'number' ? d.unit : ''
      })()
    : ''
  const faults = asItems(doc.faults)
  const hints = byId(asItems(doc.hints))
  const fault = (v: unknown) => {
    const f = typeof v === 'number' ? faults[v] : undefined
    return f ? faultWords(f, state) : 'a fault the scenario does not have'
  }
  const devices = (v: unknown) =>
    asStrings(v)
      .map((id) => deviceName(id, state))
      .join(', ') || 'none'
  const words: Record<string, string> = {}
  const put = (label: string, value: unknown, say: (v: unknown) => string) => {
    if (value !== undefined) words[label] = say(value)
  }
  put('kind', o.kind, kindWords)
  put('setting', o.key, (v) => settingName(String(v)))
  put('value', o.value, (v) => settingValueName(key, v))
  put('lowest value', o.min, (v) => numberWords(v, unit))
  put('highest value', o.max, (v) => numberWords(v, unit))
  put('device', o.device, (v) => deviceName(String(v), state))
  put('effect', o.effect, (v) => (v === 'raises' ? 'raises the speed' : 'lowers the speed'))
  put('then holds the speed', o.thenHolds, yesNo)
  put('hold time', o.holdSeconds, (v) => numberWords(v, 's'))
  put('target speed', o.target, (v) => numberWords(v, o.unit === 'rpm' ? 'rpm' : 'Hz'))
  put('tolerance', o.tolerance, (v) => numberWords(v, o.unit === 'rpm' ? 'rpm' : 'Hz'))
  put('stopping by', o.mode, (v) => (v === 'coast' ? 'coasting to a stop' : 'ramping to a stop'))
  put('stop begins at or above', o.fromAtLeastHz, (v) => numberWords(v, 'Hz'))
  put('across a power loss', o.acrossPowerLoss, yesNo)
  put('remembered speed at least', o.minReferenceHz, (v) => numberWords(v, 'Hz'))
  put('speed tolerance', o.toleranceHz, (v) => numberWords(v, 'Hz'))
  put('safe voltage below', o.thresholdVolts, (v) => numberWords(v, 'V'))
  put('test points', o.pairs, (v) =>
    Array.isArray(v) ? v.map((p) => pairName(p as [string, string], state)).join('; ') : 'the usual ones',
  )
  put('meter proved before', o.proveMeterBefore, yesNo)
  put('meter proved after', o.proveMeterAfter, yesNo)
  put('fault', o.fault, fault)
  put('time allowed', o.minutes, (v) => numberWords(v, 'min'))
  put('points off each', o.costEach, points)
  put(
    'hints offered',
    o.hints,
    (v) =>
      asStrings(v)
        .map((id) => quote(hints.get(id)?.text, 40))
        .join(', ') || 'none',
  )
  if (o.kind === 'wiringCondition') {
    const when = asDoc(o.while)
    put('devices held', when.held, devices)
    put('devices released', when.released, devices)
    put('every push-button released', when.nothingHeld, yesNo)
    put('positions', when.positions, (v) =>
      Object.entries(asDoc(v))
        .map(([id, p]) => `${deviceName(id, state)} at ${positionWords(state.devices[id]?.spec.kind, p)}`)
        .join(', '),
    )
    const input = asDoc(o.input)
    put('input', o.input, () =>
      typeof input.function === 'string'
        ? `the input set to ${quote(inputFunctionName(input.function))}`
        : pointName(typeof input.point === 'string' ? input.point : null, state),
    )
    put('expected', o.expect, (v) =>
      typeof v === 'string'
        ? v
        : `${numberWords(asDoc(v).minVolts, 'V')} to ${numberWords(asDoc(v).maxVolts, 'V')}`,
    )
  }
  if (o.kind === 'diagnosisCorrect' && o.expect) {
    const expect = asDoc(o.expect)
    put('part named', expect.target, (v) => {
      try {
        return diagnosisTargetName(v as DiagnosisTarget, state) ?? 'a part the panel does not have'
      } catch {
        return 'a part the panel does not have'
      }
    })
    put('findings accepted', expect.findings, (v) =>
      asStrings(v)
        .map((f) => DIAGNOSIS_FINDING_SHORT[f as DiagnosisFinding] ?? 'an unknown finding')
        .join(', '),
    )
  }
  return words
}

function objectiveSummary(o: Item): string {
  const required = o.required === true ? ', required' : ''
  return `${quote(o.title)} (${kindWords(o.kind)}, ${points(o.weight)}${required})`
}

function objectiveChanges(a: Doc, b: Doc, stateA: SimState, stateB: SimState): string[] {
  const was = byId(asItems(a.objectives))
  const now = byId(asItems(b.objectives))
  const out: string[] = []
  for (const [id, o] of now) {
    const old = was.get(id)
    if (!old) {
      out.push(`Objective added: ${objectiveSummary(o)}`)
      continue
    }
    const name = `Objective ${quote(o.title)}`
    if (!same(old.title, o.title)) out.push(`Objective ${quote(old.title)} renamed ${quote(o.title)}`)
    if (!same(old.weight, o.weight)) out.push(`${name}: ${points(old.weight)} → ${points(o.weight)}`)
    if (Boolean(old.required) !== Boolean(o.required))
      out.push(`${name}: ${o.required ? 'now required to pass' : 'no longer required to pass'}`)
    // A field counts as changed when it reads differently with both named by the new document (so that
    // renaming a device or removing a hint is reported once, where it happened, not on every objective).
    const before = objectiveFieldWords(old, a, stateA)
    const beforeNamedNow = objectiveFieldWords(old, b, stateB)
    const after = objectiveFieldWords(o, b, stateB)
    for (const label of new Set([...Object.keys(before), ...Object.keys(after)])) {
      if (beforeNamedNow[label] === after[label]) continue
      out.push(`${name}: ${label} ${before[label] ?? 'not set'} → ${after[label] ?? 'not set'}`)
    }
  }
  for (const [id, o] of was) if (!now.has(id)) out.push(`Objective removed: ${objectiveSummary(o)}`)
  return out
}

/** Every change from `before` to `after`, grouped in CHANGE_SECTIONS order; empty when they match. */
export function compareScenarios(before: unknown, after: unknown): ScenarioChange[] {
  const a = asDoc(before)
  const b = asDoc(after)
  const stateA = namingState(a)
  const stateB = namingState(b)
  const tag = (section: ChangeSection, texts: string[]) => texts.map((text) => ({ section, text }))
  return [
    ...tag('The exercise', exerciseChanges(a, b)),
    ...tag('Starting state', [
      ...deviceChanges(a, b, stateB),
      ...wireChanges(a, b, stateA, stateB),
      ...settingChanges(a, b),
      ...powerChanges(a, b),
      ...machineChanges(a, b),
    ]),
    ...tag('Faults', faultChanges(a, b, stateA, stateB)),
    ...tag('Hints', hintChanges(a, b)),
    ...tag('Objectives', objectiveChanges(a, b, stateA, stateB)),
  ]
}
