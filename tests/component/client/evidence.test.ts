// The attempt pages read the grader's real result (shared/api gradeResultSchema), not a shape of their own.
import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { gradeResultSchema, type GradeResult } from '@shared/api'
import { grade, scenarioSchema } from '@shared/scenario'
import safeIsolation from '../../../scenarios/safe-isolation.json'
import AttemptEvidence from '@/components/attempts/AttemptEvidence.vue'
import { readEvidence } from '@/components/attempts/evidence'
import { testVuetify } from './helpers'

describe('reading the grader’s evidence', () => {
  const scenario = scenarioSchema.parse(safeIsolation)
  const result = gradeResultSchema.parse(grade(scenario, [{ t: 0, type: 'attempt.ended' }]))

  it('lists every objective with its points, its kind in words and the grader’s own words', () => {
    const view = readEvidence(result)
    expect(view.objectives).toHaveLength(scenario.objectives.length)
    view.objectives.forEach((line, i) => {
      const source = result.objectives[i]!
      expect(line).toMatchObject({
        id: source.id,
        title: source.title,
        passed: source.met,
        points: source.pointsEarned,
        possible: source.pointsPossible,
        detail: source.evidence,
        required: source.required,
      })
      expect(line.kind).not.toBe(source.kind)
    })
    expect(view.objectives.map((o) => o.kind)).toEqual([
      'Left isolated',
      'Absence of voltage proved',
      'Finished in time',
    ])
    expect(view.summary).toBe(result.summary)
  })

  it('keeps safety violations and hints apart from the objectives, hints by their words', () => {
    const withViolation: GradeResult = {
      ...result,
      safetyViolations: [
        { kind: 'workWhileEnergised', t: 42_300, text: 'Wire W3 added while the DC bus was at 512 V' },
      ],
      hintsUsed: [{ id: 'hint-bus', t: 1000, cost: 10, text: 'Wait for the DC bus to discharge.' }],
    }
    const view = readEvidence(withViolation)
    expect(view.violations).toEqual([
      { atMs: 42_300, at: '00:42.3', text: 'Wire W3 added while the DC bus was at 512 V' },
    ])
    expect(view.hints).toEqual([
      { id: 'hint-bus', label: 'Wait for the DC bus to discharge.', cost: 10, atMs: 1000, at: '00:01.0' },
    ])
  })

  it('numbers the hints of a grade stored before hints kept their words', () => {
    const older: GradeResult = { ...result, hintsUsed: [{ id: 'hint-bus', t: 1000, cost: 10 }] }
    expect(readEvidence(older).hints[0]!.label).toBe('Hint 1')
  })

  it('shows nothing for an attempt without a kept result', () => {
    expect(readEvidence(null)).toEqual({ objectives: [], violations: [], hints: [], summary: '' })
  })

  it('shows no hint id on the page', () => {
    const wrapper = mount(AttemptEvidence, {
      props: {
        evidence: {
          ...result,
          hintsUsed: [{ id: 'hint-bus', t: 1000, cost: 10, text: 'Wait for the bus.' }],
        },
      },
      global: { plugins: [testVuetify()] },
    })
    expect(wrapper.text()).toContain('Wait for the bus.')
    expect(wrapper.text()).toContain('−10 points')
    expect(wrapper.text()).not.toContain('hint-bus')
  })
})
