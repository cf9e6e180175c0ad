// The checks an author gets that a schema cannot make: an objective already met before the apprentice
// does anything, more input functions than inputs, and every problem's place and message in words.
import { describe, expect, it } from 'vitest'
import { DIGITAL_INPUT_NUMBERS } from '@shared/model/points'
import { checkScenario, type Scenario } from '@shared/scenario'
import {
  impossibleObjectives,
  objectivesMetAtStart,
  tooManyInputFunctions,
  unattachedHints,
} from '@shared/scenario/authoringChecks'
import { z } from 'zod'
import { parseJsonPath, plainIssueMessage, problemPlace } from '@shared/scenario/problemWords'
import { shippedScenario } from './helpers'

const problemsOf = (input: unknown) => {
  const result = checkScenario(input)
  return result.ok ? [] : result.problems
}

describe('an objective already met at the start', () => {
  it('is reported for an isolation objective when the scenario starts isolated and locked', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop'))
    scenario.start.power = { on: false, locked: true }
    scenario.objectives.push({ id: 'iso', kind: 'isolated', title: 'Drive isolated and locked', weight: 5 })
    const problems = objectivesMetAtStart(scenario)
    expect(problems).toEqual([
      expect.objectContaining({ path: ['objectives', scenario.objectives.length - 1] }),
    ])
    expect(problems[0].message).toMatch(/Already met at the start/)
  })

  it('is not reported when the apprentice has to isolate (the drive starts energised)', () => {
    const scenario = structuredClone(shippedScenario('safe-isolation'))
    expect(scenario.start.power.on).toBe(true)
    expect(scenario.objectives.some((o) => o.kind === 'isolated')).toBe(true)
    expect(objectivesMetAtStart(scenario)).toEqual([])
  })

  it('is reported for a setting the drive already has, and not for rules that hold until broken', () => {
    const scenario = structuredClone(shippedScenario('fan-ramp-or-coast'))
    expect(scenario.start.settings['stop.mode']).toBe('ramp')
    scenario.objectives.push({
      id: 'ramp-chosen',
      kind: 'settingEquals',
      title: 'Ramp stop chosen',
      weight: 5,
      key: 'stop.mode',
      value: 'ramp',
    })
    // noFaultTrips and finishedWithin are met with nothing done, by design.
    expect(scenario.objectives.some((o) => o.kind === 'noFaultTrips')).toBe(true)
    const problems = objectivesMetAtStart(scenario)
    expect(problems.map((p) => scenario.objectives[p.path[1] as number].id)).toEqual(['ramp-chosen'])
  })

  it('stops the scenario from validating, with the objective named in words', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop')) as Scenario
    scenario.start.power = { on: false, locked: true }
    scenario.objectives.push({ id: 'iso', kind: 'isolated', title: 'Drive isolated and locked', weight: 5 })
    const problems = problemsOf(scenario)
    expect(problems).toHaveLength(1)
    expect(problems[0].place).toBe(`Objective ${scenario.objectives.length} (Drive isolated and locked)`)
  })
})

describe('more input functions than inputs', () => {
  it('is reported when the objectives need more functions than the drive has inputs', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop'))
    const functions = ['run', 'stop', 'start', 'reverse', 'raise', 'lower', 'externalFault', 'reset', 'jog']
    scenario.objectives = functions.map((fn, i) => ({
      id: `in-${i}`,
      kind: 'wiringCondition' as const,
      title: `Input ${fn} on`,
      weight: 1,
      while: {},
      input: { function: fn },
      expect: 'on' as const,
    }))
    const problems = tooManyInputFunctions(scenario)
    const distinct = new Set(functions).size
    expect(distinct).toBeGreaterThan(DIGITAL_INPUT_NUMBERS.length)
    expect(problems).toHaveLength(1)
    expect(problems[0].message).toContain(`${distinct} different input functions`)
  })

  it('is not reported for a shipped scenario', () => {
    expect(tooManyInputFunctions(shippedScenario('raise-lower-commissioning'))).toEqual([])
  })
})

describe('a hint attached to nothing', () => {
  it('is reported when no objective lists the hint, and named in words', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop'))
    scenario.hints.push({ id: 'hint-extra', text: 'Check the common.', cost: 2 })
    const problems = unattachedHints(scenario)
    expect(problems).toEqual([
      {
        path: ['hints', scenario.hints.length - 1],
        message: expect.stringMatching(/attach it to the objective/),
      },
    ])
    expect(problemsOf(scenario).map((p) => p.place)).toEqual([
      `Hint ${scenario.hints.length} (Check the common.)`,
    ])
  })

  it('is not reported once an objective lists it', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop'))
    scenario.hints.push({ id: 'hint-extra', text: 'Check the common.', cost: 2 })
    scenario.objectives[0].hints = ['hint-extra']
    expect(unattachedHints(scenario)).toEqual([])
  })

  it.each(['two-wire-run-stop', 'safe-isolation', 'fan-ramp-or-coast'])(
    'is not reported for the shipped %s',
    (id) => {
      expect(unattachedHints(shippedScenario(id))).toEqual([])
    },
  )
})

describe('an objective the bench can never show', () => {
  const withWiring = (edit: (objective: Record<string, unknown>) => void) => {
    const scenario = structuredClone(shippedScenario('raise-lower-commissioning'))
    const index = scenario.objectives.findIndex((o) => o.id === 'raise-on')
    edit(scenario.objectives[index] as unknown as Record<string, unknown>)
    return { scenario, index }
  }

  it('is not reported for a shipped scenario full of wiring objectives', () => {
    const scenario = shippedScenario('raise-lower-commissioning')
    expect(scenario.objectives.filter((o) => o.kind === 'wiringCondition').length).toBeGreaterThan(3)
    expect(impossibleObjectives(scenario)).toEqual([])
    expect(impossibleObjectives(shippedScenario('potentiometer-reference'))).toEqual([])
  })

  it('reports a button to be held and released at the same moment', () => {
    const { scenario, index } = withWiring((o) => {
      const held = (o.while as { held: string[] }).held
      o.while = { held, released: [...held] }
    })
    const problems = impossibleObjectives(scenario)
    expect(problems).toEqual([
      { path: ['objectives', index, 'while', 'released'], message: expect.any(String) },
    ])
    expect(problems[0].message).toMatch(/cannot be held and released at the same moment/)
  })

  it('reports a button held while nothing may be pressed', () => {
    const { scenario, index } = withWiring((o) => {
      o.while = { ...(o.while as object), nothingHeld: true }
    })
    expect(impossibleObjectives(scenario)).toEqual([
      { path: ['objectives', index, 'while', 'nothingHeld'], message: expect.stringMatching(/drop one/) },
    ])
  })

  it('reports ON or OFF asked of a terminal that is not a digital input, and not of one that is', () => {
    const onAnalog = withWiring((o) => {
      o.input = { point: 'drive.ai' }
      o.expect = 'on'
    })
    expect(impossibleObjectives(onAnalog.scenario)).toEqual([
      {
        path: ['objectives', onAnalog.index, 'expect'],
        message: expect.stringMatching(/Only a digital input/),
      },
    ])
    const onInput = withWiring((o) => {
      o.input = { point: 'drive.di3' }
      o.expect = 'on'
    })
    expect(impossibleObjectives(onInput.scenario)).toEqual([])
  })

  it('reports a voltage window above the +24 V supply or below the common, and not one inside', () => {
    // The control supply is 24 V (shared/model/circuit/constants.ts, common practice for drives).
    const above = withWiring((o) => {
      o.input = { point: 'drive.ai' }
      o.expect = { minVolts: 30, maxVolts: 40 }
    })
    expect(impossibleObjectives(above.scenario)).toEqual([
      {
        path: ['objectives', above.index, 'expect', 'minVolts'],
        message: expect.stringMatching(/24 V supply/),
      },
    ])
    const below = withWiring((o) => {
      o.input = { point: 'drive.ai' }
      o.expect = { minVolts: -5, maxVolts: -1 }
    })
    expect(impossibleObjectives(below.scenario)).toEqual([
      {
        path: ['objectives', below.index, 'expect', 'maxVolts'],
        message: expect.stringMatching(/below the common/),
      },
    ])
    const inside = withWiring((o) => {
      o.input = { point: 'drive.ai' }
      o.expect = { minVolts: 23, maxVolts: 30 }
    })
    expect(impossibleObjectives(inside.scenario)).toEqual([])
  })

  it('stops the scenario from validating, the objective named in words', () => {
    const { scenario, index } = withWiring((o) => {
      o.input = { point: 'drive.ai' }
      o.expect = 'off'
    })
    const problems = problemsOf(scenario)
    expect(problems).toHaveLength(1)
    expect(problems[0].place).toMatch(new RegExp(`^Objective ${index + 1} \\(Holding FASTER .*\\), expect$`))
  })
})

describe('problems in words', () => {
  const doc = {
    objectives: [{ title: 'Fan ran at 40 Hz' }, {}],
    start: { wires: [{ id: 'w1' }], devices: [{ label: 'Fan run / stop' }] },
  }
  it('names the place as the editor does, with the item’s own title or label', () => {
    expect(problemPlace(['objectives', 0, 'target'], doc)).toBe('Objective 1 (Fan ran at 40 Hz), target')
    expect(problemPlace(['objectives', 1, 'fromAtLeastHz'], doc)).toBe('Objective 2, from at least hz')
    expect(problemPlace(['start', 'devices', 0, 'kind'], doc)).toBe(
      'Starting device 1 (Fan run / stop), kind',
    )
    expect(problemPlace(['start', 'settings', 'speed.max'], doc)).toBe('Starting setting “speed.max”')
    expect(problemPlace(['faults', 0, 'wireId'], doc)).toBe('Fault 1, wire')
    expect(problemPlace(['site', 'name'], doc)).toBe('Site')
    expect(problemPlace(['start', 'motor', 'ratedRpm'], doc)).toBe('Motor nameplate, rated speed')
    expect(problemPlace(['start', 'motor', 'fullLoadAmps'], doc)).toBe('Motor nameplate, full-load current')
    expect(problemPlace(['learningOutcomes', 2], doc)).toBe('Learning outcomes line 3')
  })

  it('reads back a JSON path the API sent, odd keys included', () => {
    expect(parseJsonPath('$.objectives[3].target')).toEqual(['objectives', 3, 'target'])
    expect(parseJsonPath('$.start.settings["speed.max"]')).toEqual(['start', 'settings', 'speed.max'])
  })

  it('replaces zod’s own wording and keeps a message the schema wrote', () => {
    const base = { path: [], input: undefined }
    expect(
      plainIssueMessage({
        ...base,
        code: 'too_small',
        origin: 'string',
        minimum: 3,
        message: 'Too small: expected string to have >=3 characters',
      }),
    ).toBe('Write at least 3 characters')
    expect(
      plainIssueMessage({
        ...base,
        code: 'too_small',
        origin: 'array',
        minimum: 1,
        message: 'Too small: expected array to have >=1 items',
      }),
    ).toBe('Add at least one')
    expect(
      plainIssueMessage({
        ...base,
        code: 'invalid_type',
        expected: 'number',
        message: 'Invalid input: expected number, received undefined',
      }),
    ).toBe('Missing: fill this in')
    expect(
      plainIssueMessage({
        ...base,
        code: 'invalid_format',
        format: 'regex',
        message: 'Not a terminal: choose one from the list',
      }),
    ).toBe('Not a terminal: choose one from the list')
  })

  it('words a strict bound as strict: a weight of 0 is refused with "More than 0", not "At least 0"', () => {
    const issueOf = (schema: z.ZodType, value: unknown) => schema.safeParse(value).error!.issues[0]!
    expect(plainIssueMessage(issueOf(z.number().positive(), 0))).toBe('More than 0')
    expect(plainIssueMessage(issueOf(z.number().min(0), -1))).toBe('At least 0')
    expect(plainIssueMessage(issueOf(z.number().lt(10), 10))).toBe('Less than 10')
    expect(plainIssueMessage(issueOf(z.number().max(10), 11))).toBe('At most 10')
  })

  it('places a schema problem in words with a plain message', () => {
    const scenario = structuredClone(shippedScenario('two-wire-run-stop')) as Partial<Scenario>
    scenario.title = 'ab'
    delete scenario.story
    const problems = problemsOf(scenario)
    expect(problems.find((p) => p.path === '$.title')).toMatchObject({
      place: 'Title',
      message: 'Write at least 3 characters',
    })
    expect(problems.find((p) => p.path === '$.story')).toMatchObject({
      place: 'Story',
      message: 'Missing: fill this in',
    })
  })
})
