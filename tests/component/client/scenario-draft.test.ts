// The scenario editor's working copy: a whole document the forms edit, checked by the shared checkScenario.
import { describe, expect, it } from 'vitest'
import raiseLower from '../../../scenarios/raise-lower-commissioning.json'
import {
  blankDocument,
  checkDraft,
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
})
