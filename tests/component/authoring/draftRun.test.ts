// What a draft needs before the panel opens it, what stops the author saving the start, and the words for
// a run's grade and the server's verdict on a reference solution.
import { describe, expect, it } from 'vitest'
import { applyEvent, createSimulation } from '@shared/model'
import { toSimulationSetup } from '@shared/scenario/setup'
import { scenarioSchema } from '@shared/scenario/schema'
import scenarioFile from '../../../scenarios/two-wire-run-stop.json'
import { checkDraftForPanel, setupRefusal, startInWords } from '@/simulator/authoring/draftRun'
import { MISSED_SHOWN, referenceWords, runGradeWords } from '@/simulator/authoring/resultWords'
import { grade } from '@shared/scenario/grade'
import { STATUS_SCREEN } from '@/simulator/scene/keypadMenu'

const doc = () => structuredClone(scenarioFile) as unknown as Record<string, unknown>

describe('checkDraftForPanel', () => {
  it('lets a complete draft be tried and an incomplete one only be set up', () => {
    const incomplete = { ...doc(), objectives: [], story: '' }
    expect(checkDraftForPanel(doc(), 'Fan', 'try').ok).toBe(true)
    const refused = checkDraftForPanel(incomplete, 'Fan', 'reference')
    expect(refused.ok).toBe(false)
    expect(JSON.stringify(refused)).not.toContain('$.')
    const setup = checkDraftForPanel(incomplete, 'Fan', 'setup')
    expect(setup.ok && setup.scenario.faults).toEqual([])
  })

  it('refuses to set up a draft with no usable start, in words, without throwing', () => {
    const noStart = { title: 'Half a scenario' }
    const refused = checkDraftForPanel(noStart, 'Half a scenario', 'setup')
    expect(refused.ok).toBe(false)
    if (!refused.ok) expect(refused.problems[0]!.message).toBeTruthy()
    const badSetting = doc()
    ;(badSetting.start as { settings: Record<string, unknown> }).settings['speed.max'] = 'fast'
    expect(checkDraftForPanel(badSetting, 'Fan', 'setup').ok).toBe(false)
  })
})

describe('setupRefusal', () => {
  const scenario = scenarioSchema.parse(scenarioFile)
  const fresh = () => createSimulation({ ...toSimulationSetup(scenario), faults: [] })

  it('allows a panel at rest', () => expect(setupRefusal(fresh(), STATUS_SCREEN, false)).toBeNull())

  it('refuses a wire being drawn, an unsaved setting, a keypad edit and a turning motor', () => {
    expect(setupRefusal(fresh(), STATUS_SCREEN, true)).toMatch(/wire is being drawn/)
    const pending = applyEvent(fresh(), {
      t: 10,
      type: 'setting.changed',
      key: 'ramp.accelSeconds',
      value: 9,
    })
    expect(setupRefusal(pending, STATUS_SCREEN, false)).toMatch(/not saved on the keypad/)
    expect(setupRefusal(fresh(), { screen: 'edit', group: 0, item: 0, value: 1 }, false)).toMatch(/keypad/)
    let running = applyEvent(fresh(), { t: 10, type: 'keypad.key', key: 'run' })
    running = applyEvent(running, { t: 5000, type: 'meter.mode', mode: 'off' })
    expect(setupRefusal(running, STATUS_SCREEN, false)).toMatch(/motor is turning/)
  })
})

describe('words', () => {
  it('says what the apprentice finds at the disconnect', () => {
    expect(startInWords({ on: true, locked: false })).toContain('ON and the panel live')
    expect(startInWords({ on: false, locked: true, supervisorLock: { name: 'X' } })).toBe(
      "Apprentices will find the disconnect OFF, with their own lock on it and a supervisor's lock.",
    )
  })

  it('names what a reference run misses, and full marks as such', () => {
    const base = {
      score: 100,
      passed: true,
      pointsEarned: 60,
      pointsPossible: 60,
      missed: [],
      safetyViolations: 0,
    }
    expect(referenceWords({ ...base, fullMarks: true }).good).toBe(true)
    const missing = referenceWords({
      ...base,
      fullMarks: false,
      score: 50,
      missed: ['Ramp set'],
      safetyViolations: 2,
    })
    expect(missing.good).toBe(false)
    expect(missing.lines).toContain('Misses: Ramp set')
    expect(missing.lines.join(' ')).toContain('2 safety violations')
  })

  it('names the first objectives a tried run missed and counts the rest', () => {
    const scenario = scenarioSchema.parse(scenarioFile)
    const result = grade(scenario, [{ t: 10, type: 'attempt.ended' }])
    const notMet = result.objectives.filter((o) => !o.met)
    const words = runGradeWords(result)
    expect(words.title).toBe(`Graded: ${result.score} / 100 — not passed`)
    expect(words.lines[0]).toBe(`Not met: ${notMet[0]!.title}`)
    if (notMet.length > MISSED_SHOWN)
      expect(words.lines).toContain(
        `…and ${notMet.length - MISSED_SHOWN} more objective${notMet.length - MISSED_SHOWN === 1 ? '' : 's'} not met`,
      )
  })
})
