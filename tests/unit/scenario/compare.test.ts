// compareScenarios: the readable list of changes between two scenario documents.
import { describe, expect, it } from 'vitest'
import { compareScenarios, type ScenarioChange } from '@shared/scenario/compare'
import { OBJECTIVE_KINDS, type Scenario } from '@shared/scenario'
import { SETTING_KEYS } from '@shared/model'
import { shippedScenario } from './helpers'

const base = () => structuredClone(shippedScenario('dead-control-circuit'))
const texts = (changes: ScenarioChange[]) => changes.map((c) => c.text)

/** Every identifier a document holds that a person must never read: ids, keys, enum values. */
function rawIdentifiers(...docs: Scenario[]): string[] {
  const found = new Set<string>([...OBJECTIVE_KINDS, ...SETTING_KEYS])
  for (const doc of docs) {
    found.add(doc.id)
    for (const d of doc.start.devices) found.add(d.id)
    for (const w of doc.start.wires) found.add(w.id).add(w.from).add(w.to)
    for (const h of doc.hints) found.add(h.id)
    for (const o of doc.objectives) found.add(o.id)
    for (const f of doc.faults) found.add(f.kind)
  }
  found.add('variableTorque').add('constantTorque').add('brokenWire').add('settingChanged')
  // Plain English words (a kind such as "selector") may appear; identifiers have a capital, a dot or a hyphen.
  return [...found].filter((id) => /[A-Z.\-_]/.test(id.slice(1)))
}

function expectNoLeaks(changes: ScenarioChange[], ...docs: Scenario[]) {
  const all = texts(changes).join('\n')
  for (const id of rawIdentifiers(...docs))
    expect(all, `leaks ${id}`).not.toMatch(new RegExp(`(^|[^\\w])${id.replace(/[.\-]/g, '\\$&')}($|[^\\w])`))
}

describe('compareScenarios', () => {
  it('finds nothing between a document and its copy', () => {
    expect(compareScenarios(base(), base())).toEqual([])
  })

  it('reports the fields of the exercise with before and after in words', () => {
    const a = base()
    const b = base()
    b.title = 'The fan that would not start'
    b.difficulty = a.difficulty === 'advanced' ? 'introductory' : 'advanced'
    b.estimatedMinutes = a.estimatedMinutes + 15
    b.passMark = a.passMark + 5
    b.site.people = [...b.site.people, 'Ines Corrow, shift lead']
    b.learningOutcomes = b.learningOutcomes.slice(1)
    b.safetyNotes = [...b.safetyNotes, 'Prove the tester on a known live source first.']
    b.story = `${a.story} The night shift is waiting.`
    const changes = compareScenarios(a, b)
    expect(changes.every((c) => c.section === 'The exercise')).toBe(true)
    const words = texts(changes)
    expect(words).toContain(`Title: “${a.title}” → “The fan that would not start”`)
    expect(words).toContain(`Difficulty: ${a.difficulty} → ${b.difficulty}`)
    expect(words).toContain(`Estimated time: ${a.estimatedMinutes} min → ${a.estimatedMinutes + 15} min`)
    expect(words).toContain(`Pass mark: ${a.passMark} points → ${a.passMark + 5} points`)
    expect(words).toContain('Person in the story added: “Ines Corrow, shift lead”')
    expect(words.some((t) => t.startsWith('Learning outcome removed: '))).toBe(true)
    expect(words).toContain('Safety note added: “Prove the tester on a known live source first.”')
    expect(words.some((t) => t.startsWith('Story rewritten'))).toBe(true)
    expectNoLeaks(changes, a, b)
  })

  it('names devices, wires, settings and power in the starting state as the panel does', () => {
    const a = base()
    const b = base()
    b.start.devices.push({ id: 'stopButton', kind: 'pushbutton', label: 'Fan stop', contact: 'NC' })
    b.start.devices[0]!.label = 'Evaporator fan run / stop'
    b.start.wires = b.start.wires.filter((w) => w.id !== 'wCom')
    b.start.wires.push({ id: 'w7', from: 'drive.p24', to: 'stopButton.a', colour: 'whiteBlue' })
    b.start.wires.find((w) => w.id === 'wRunOut')!.to = 'drive.di2'
    b.start.settings['speed.max'] = 45
    delete b.start.settings['reference.keypadSetpoint']
    b.start.power = { on: false, locked: true, supervisorLock: { name: 'Ines Corrow' } }
    const changes = compareScenarios(a, b)
    expect(changes.every((c) => c.section === 'Starting state')).toBe(true)
    const words = texts(changes)
    expect(words).toContain('Device added: “Fan stop” (push-button, normally closed contact)')
    expect(words).toContain('Device “Fan run / stop” renamed “Evaporator fan run / stop”')
    expect(words).toContain('Wire W7 added from +24 to Fan stop terminal 11 (white/blue)')
    expect(words.some((t) => /^Wire W1 removed; it ran from \S+ to \S+ \(blue\)$/.test(t))).toBe(true)
    expect(
      words.some((t) => t.startsWith('Wire W2 now runs from Evaporator fan run / stop terminal 14 to DI2')),
    ).toBe(true)
    expect(words.some((t) => /^Starting setting "[^"]+": 50 Hz → 45 Hz$/.test(t))).toBe(true)
    expect(words.some((t) => /^Starting setting "[^"]+": 40 Hz → .+ \(its default\)$/.test(t))).toBe(true)
    expect(words).toContain('Power at the start: on → off')
    expect(words).toContain('The apprentice’s own lock at the start: off → on')
    expect(words).toContain('Supervisor’s lock at the start: none → “Ines Corrow”’s lock')
    expectNoLeaks(changes, a, b)
  })

  it('tells a renamed machine from a change to its load', () => {
    const a = base()
    const renamed = base()
    renamed.start.machine = { ...a.start.machine!, name: 'Cold-store fan CF-2' }
    expect(texts(compareScenarios(a, renamed))).toEqual([
      `Machine's name: “${a.start.machine!.name}” → “Cold-store fan CF-2”`,
    ])
    const heavier = base()
    heavier.start.machine = { ...a.start.machine!, loadFraction: 0.95 }
    expect(texts(compareScenarios(a, heavier))).toEqual([
      'Driven machine changed (its load or how it slows down)',
    ])
  })

  it('reports faults and hints added, removed and changed', () => {
    const a = base()
    const b = base()
    b.faults = [b.faults[1]!, { kind: 'settingChanged', key: 'speed.max', value: 30 }]
    b.hints[0]!.cost = 2
    b.hints[1]!.text = 'Measure across each wire in turn with the selector at RUN.'
    b.hints.push({ id: 'hint-new', text: 'Check the fuse first.', cost: 1 })
    b.hints.splice(0, 0)
    const changes = compareScenarios(a, b)
    const words = texts(changes)
    expect(words).toContain('Fault removed: the blown control fuse')
    expect(words.some((t) => /^Fault added: the setting "[^"]+" changed to 30 Hz$/.test(t))).toBe(true)
    expect(words.some((t) => /^Hint “Start at the source.*: costs 5 points → 2 points$/.test(t))).toBe(true)
    expect(
      words.some((t) => t.endsWith('reworded: “Measure across each wire in turn with the selector at RUN.”')),
    ).toBe(true)
    expect(words).toContain('Hint added: “Check the fuse first.” (costs 1 point)')
    const removed = base()
    removed.hints = removed.hints.slice(1)
    expect(texts(compareScenarios(a, removed))).toEqual([`Hint removed: “${a.hints[0]!.text}”`])
    expectNoLeaks(changes, a, b)
  })

  it('reports objectives added, removed and changed, their fields in words', () => {
    const a = base()
    const b = base()
    const speed = b.objectives.find((o) => o.kind === 'speedHeld')!
    speed.title = 'Fan held at speed'
    speed.weight += 5
    speed.required = true
    if (speed.kind === 'speedHeld') speed.holdSeconds += 10
    b.objectives = b.objectives.filter((o) => o.kind !== 'noWiringWhileEnergised')
    b.objectives.push({
      id: 'limit',
      kind: 'settingEquals',
      title: 'Top speed set to 45 Hz',
      weight: 10,
      key: 'speed.max',
      value: 45,
    })
    const oldSpeed = a.objectives.find((o) => o.kind === 'speedHeld')!
    const changes = compareScenarios(a, b)
    expect(changes.every((c) => c.section === 'Objectives')).toBe(true)
    const words = texts(changes)
    expect(words).toContain(`Objective “${oldSpeed.title}” renamed “Fan held at speed”`)
    expect(words).toContain(
      `Objective “Fan held at speed”: ${oldSpeed.weight} points → ${oldSpeed.weight + 5} points`,
    )
    expect(words).toContain('Objective “Fan held at speed”: now required to pass')
    expect(words.some((t) => /^Objective “Fan held at speed”: hold time \d+ s → \d+ s$/.test(t))).toBe(true)
    expect(words).toContain('Objective added: “Top speed set to 45 Hz” (drive setting, 10 points)')
    expect(
      words.some((t) => /^Objective removed: “.+” \(no work on live terminals, \d+ points/.test(t)),
    ).toBe(true)
    expectNoLeaks(changes, a, b)
  })

  it('names an objective’s setting and value by the catalogue', () => {
    const a = base()
    a.objectives.push({
      id: 'limit',
      kind: 'settingEquals',
      title: 'Top speed',
      weight: 10,
      key: 'speed.max',
      value: 45,
    })
    const b = structuredClone(a)
    const limit = b.objectives.at(-1)!
    if (limit.kind === 'settingEquals') limit.value = 40
    const words = texts(compareScenarios(a, b))
    expect(words).toHaveLength(1)
    expect(words[0]).toMatch(/^Objective “Top speed”: value 45 Hz → 40 Hz$/)
  })

  it('compares an incomplete draft without throwing, and a draft against nothing', () => {
    const a = base()
    const draft = { id: a.id, title: 'Half written', start: { devices: [{ id: 'x1', kind: 'pushbutton' }] } }
    const changes = compareScenarios(a, draft)
    expect(texts(changes)).toContain(`Title: “${a.title}” → “Half written”`)
    expect(texts(changes).some((t) => t.startsWith('Objective removed'))).toBe(true)
    expect(compareScenarios({}, {})).toEqual([])
    // Kinds no list knows (a draft may hold anything) still read as words.
    const odd = { ...a, faults: [{ kind: 'gremlin' }] }
    const words = texts(compareScenarios(a, odd)).join('\n')
    expect(words).toContain('Fault added: a fault of a kind the simulator does not have')
    expect(words).not.toMatch(/undefined|gremlin|\[object/)
    expectNoLeaks(changes, a)
  })
})
