// The scenario editor's working copy: a whole document the forms edit, checked by the shared checkScenario.
import { describe, expect, it } from 'vitest'
import raiseLower from '../../../scenarios/raise-lower-commissioning.json'
import fanRampOrCoast from '../../../scenarios/fan-ramp-or-coast.json'
import deadControl from '../../../scenarios/dead-control-circuit.json'
import potentiometerReference from '../../../scenarios/potentiometer-reference.json'
import { SHIPPED_SCENARIOS } from './shippedScenarios'
import {
  blankDocument,
  checkDraft,
  controlPointChoices,
  deviceUses,
  documentToSave,
  editorDocument,
  idFromLabel,
  keyFromTitle,
  renumberFaultsAfterRemoval,
  setMachineName,
  setSiteMachine,
  wiresLeftWithoutTerminal,
} from '@/components/scenarios/scenarioDraft'

describe('the scenario editor draft', () => {
  const shipped = () =>
    editorDocument(
      structuredClone(raiseLower) as Record<string, unknown>,
      raiseLower.id,
      raiseLower.version + 1,
    )

  it('finds no problem in a shipped scenario opened for editing', () => {
    const check = checkDraft(shipped())
    expect(check.problems).toEqual([])
    expect(check.scenario?.objectives).toHaveLength(raiseLower.objectives.length)
  })

  it('fills in the parts a half-written draft lacks, so the forms can open it', () => {
    const doc = editorDocument({ title: 'Half' }, 'half', 1)
    expect(doc.start.devices).toEqual([])
    expect(doc.start.power).toEqual({ on: false, locked: false })
    expect(doc.objectives).toEqual([])
    expect(doc.id).toBe('half')
  })

  it('drops blank lines from text lists when saving', () => {
    const doc = shipped()
    doc.safetyNotes = ['Lock off first', '', '  ']
    expect(documentToSave(doc).safetyNotes as string[]).toEqual(['Lock off first'])
  })

  it('starts a new scenario with something to fill in, in words', () => {
    const check = checkDraft(editorDocument(blankDocument(), 'night-shift-pump', 1))
    expect(check.scenario).toBeNull()
    expect(check.problems.map((p) => p.path)).toEqual(expect.arrayContaining(['$.title', '$.story']))
    for (const p of check.problems) expect(p.place).not.toMatch(/\$|\[/)
  })

  it('makes ids from labels, unique and never a reserved name', () => {
    expect(idFromLabel('Fan start', [])).toBe('fanStart')
    expect(idFromLabel('Fan start', ['fanStart'])).toBe('fanStart2')
    expect(idFromLabel('Motor', [])).toBe('motorDevice')
    expect(idFromLabel('3 way', [], 'device')).toBe('device3Way')
    expect(keyFromTitle('Night shift: pump #2')).toBe('night-shift-pump-2')
  })

  it('finds what refers to a device, and renumbers objectives when a fault goes', () => {
    const doc = shipped()
    const device = doc.start.devices[0]!
    expect(deviceUses(doc, device.id).length).toBeGreaterThan(0)
    expect(deviceUses(doc, 'nothingCalledThis')).toEqual([])
    doc.faults = [{ kind: 'blownFuse' }, { kind: 'blownFuse' }]
    doc.objectives = [
      { id: 'a', kind: 'faultFoundAndCleared', title: 'Found it', weight: 1, fault: 1 },
      { id: 'b', kind: 'faultFoundAndCleared', title: 'Found it', weight: 1, fault: 0 },
    ]
    doc.faults.splice(0, 1)
    renumberFaultsAfterRemoval(doc, 0)
    expect(doc.objectives.map((o) => ('fault' in o ? o.fault : 'none'))).toEqual([0, 'none'])
  })

  it('offers a wiring objective the drive’s inputs and every terminal of the scenario’s own devices, in words', () => {
    const doc = shipped()
    const choices = controlPointChoices(doc)
    const titles = choices.map((c) => c.title)
    expect(titles.slice(0, 7)).toEqual([
      'Terminal DI1',
      'Terminal DI2',
      'Terminal DI3',
      'Terminal DI4',
      'Terminal DI5',
      'Terminal DI6',
      'Terminal AI',
    ])
    // Two terminals for each of the three contact devices, each named as the panel labels it.
    expect(choices).toHaveLength(7 + 2 * raiseLower.start.devices.length)
    for (const device of raiseLower.start.devices) {
      const own = titles.filter((t) => t.startsWith(`${device.label} terminal `))
      expect(own, device.label).toHaveLength(2)
    }
    for (const title of titles) {
      expect(title).not.toMatch(/panel does not have|runSwitch|raiseButton|lowerButton|\./)
    }
    // A voltage window at a device terminal passes the checks; ON/OFF there is refused in words.
    const terminal = choices.find((c) => c.title.startsWith('Faster terminal'))!.value
    const base = {
      id: 'at-terminal',
      title: 'Faster feeds 24 V',
      weight: 5,
      kind: 'wiringCondition' as const,
    }
    const window = { ...base, while: { held: ['raiseButton'] }, input: { point: terminal } }
    doc.objectives.push({ ...window, expect: { minVolts: 20, maxVolts: 28 } } as never)
    expect(checkDraft(doc).problems).toEqual([])
    doc.objectives[doc.objectives.length - 1] = { ...window, expect: 'on' } as never
    expect(
      checkDraft(doc)
        .problems.map((p) => p.message)
        .join(' '),
    ).toMatch(/Only a digital input reads ON or OFF/)
    // None chosen yet: words, not the shape of an identifier.
    doc.objectives[doc.objectives.length - 1] = { ...window, input: { point: '' }, expect: 'on' } as never
    expect(checkDraft(doc).problems.map((p) => p.message)).toContain(
      'Not a terminal: choose one from the list',
    )
  })

  it('gives back each shipped scenario unchanged when it is opened and saved without edits', () => {
    expect(SHIPPED_SCENARIOS.length).toBeGreaterThan(5)
    for (const scenario of SHIPPED_SCENARIOS) {
      const opened = editorDocument(structuredClone(scenario), String(scenario.id), Number(scenario.version))
      expect(checkDraft(opened).problems, String(scenario.id)).toEqual([])
      const saved = JSON.parse(JSON.stringify(documentToSave(opened))) as unknown
      expect(saved, String(scenario.id)).toStrictEqual(scenario)
    }
  })

  it('keeps the machine’s name in step with the story’s machine while the two are the same', () => {
    const fresh = editorDocument(blankDocument(), 'night-shift-pump', 1)
    for (const text of ['K', 'Ki', 'Kiln fan KF-1']) setSiteMachine(fresh, text)
    expect(fresh.start.machine).toEqual({ name: 'Kiln fan KF-1' })
    // Emptied, the name goes with it, and the machine part too; typing again fills both again.
    setSiteMachine(fresh, '')
    expect(fresh.start.machine).toBeUndefined()
    setSiteMachine(fresh, 'Kiln fan KF-2')
    expect(fresh.start.machine?.name).toBe('Kiln fan KF-2')

    const dead = editorDocument(structuredClone(deadControl), deadControl.id, deadControl.version)
    setSiteMachine(dead, 'Freezer evaporator fan EV-7')
    expect(dead.start.machine).toEqual({ ...deadControl.start.machine, name: 'Freezer evaporator fan EV-7' })
  })

  it('leaves a machine name worded apart from the story alone', () => {
    const fan = editorDocument(structuredClone(fanRampOrCoast), fanRampOrCoast.id, fanRampOrCoast.version)
    setSiteMachine(fan, 'Kiln exhaust fan EF-9 (large impeller)')
    expect(fan.site.machine).toBe('Kiln exhaust fan EF-9 (large impeller)')
    expect(fan.start.machine?.name).toBe('Kiln exhaust fan EF-9')
    setMachineName(fan, '')
    expect(fan.start.machine).toEqual({ ...fanRampOrCoast.start.machine, name: undefined })
    expect(fan.start.machine && 'name' in fan.start.machine).toBe(false)
  })

  it('names the starting wires a device would lose by changing its kind', () => {
    const doc = editorDocument(structuredClone(deadControl), deadControl.id, deadControl.version)
    const runSwitch = doc.start.devices[0]!
    expect(wiresLeftWithoutTerminal(doc, runSwitch, 'pushbutton')).toEqual([])
    expect(wiresLeftWithoutTerminal(doc, runSwitch, 'potentiometer')).toEqual([
      'W2 (blue) from +24 to Fan run / stop terminal 13',
      'W3 (blue) from Fan run / stop terminal 14 to DI1',
    ])
    // A potentiometer's wiper wired to the analog input: a selector has no wiper.
    const pot = editorDocument(
      structuredClone(potentiometerReference),
      potentiometerReference.id,
      potentiometerReference.version,
    )
    const speedPot = pot.start.devices.find((d) => d.kind === 'potentiometer')!
    pot.start.wires = [{ id: 'w1', from: 'drive.ai', to: `${speedPot.id}.wiper`, colour: 'whiteBlue' }]
    expect(wiresLeftWithoutTerminal(pot, speedPot, 'selector')).toEqual([
      `W1 (white/blue) from AI to ${speedPot.label} wiper (W)`,
    ])
  })
})
