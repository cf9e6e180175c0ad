// The scenario editor's live check: the shared checkScenario judges every edit, mapped to the fields.
import { describe, expect, it } from 'vitest'
import raiseLower from '../../../scenarios/raise-lower-commissioning.json'
import { blankDocument, checkDraft, draftFrom } from '@/components/scenarios/scenarioDraft'

describe('the scenario editor draft', () => {
  const shipped = () =>
    draftFrom(raiseLower as Record<string, unknown>, raiseLower.id, raiseLower.version + 1)

  it('finds no problem in a shipped scenario opened for editing', () => {
    const check = checkDraft(shipped())
    expect(check.problems).toEqual([])
    expect(check.scenario?.id).toBe(raiseLower.id)
    expect(check.scenario?.objectives).toHaveLength(raiseLower.objectives.length)
  })

  it('puts a problem with the title under the title field', () => {
    const check = checkDraft({ ...shipped(), title: '' })
    expect(check.scenario).toBeNull()
    expect(check.byField.title).toBeTruthy()
    expect(check.problems.map((p) => p.path)).toContain('$.title')
  })

  it('reports a setting key the catalogue does not know, placed in words for the screen', () => {
    const draft = shipped()
    const technical = JSON.parse(draft.technical)
    technical.start.settings['speed.warp'] = 9
    const check = checkDraft({ ...draft, technical: JSON.stringify(technical) })
    expect(check.scenario).toBeNull()
    expect(check.problems.some((p) => p.path.startsWith('$.start.settings'))).toBe(true)
    // The JSON path stays on the problem for tools; the field's message names the place in words.
    expect(check.byField.technical).toMatch(/^Starting setting “speed\.warp”: /)
    expect(check.byField.technical).not.toContain('$.')
  })

  it('says when the technical part is not JSON, and keeps the text', () => {
    const draft = { ...shipped(), technical: '{ "start": ' }
    const check = checkDraft(draft)
    expect(check.byField.technical).toMatch(/not valid JSON/)
    expect(draft.technical).toBe('{ "start": ')
  })

  it('starts a new scenario with something to fill in, not something valid', () => {
    const check = checkDraft(draftFrom(blankDocument(), 'night-shift-pump', 1))
    expect(check.scenario).toBeNull()
    expect(check.byField.title).toBeTruthy()
    expect(check.byField.story).toBeTruthy()
    // In words an instructor reads: no zod phrasing, no JSON paths.
    for (const p of check.problems) {
      expect(p.message).not.toMatch(/Too small|expected string|>=/)
      expect(p.place).not.toMatch(/\$|\[/)
    }
    expect(check.byField.title).toBe('Write at least 3 characters')
  })
})
