// The scenario editor's working copy: a whole document the forms edit, checked by the shared checkScenario.
import { describe, expect, it } from 'vitest'
import raiseLower from '../../../scenarios/raise-lower-commissioning.json'
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
})
