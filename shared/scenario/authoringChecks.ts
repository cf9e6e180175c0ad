// Checks of a scenario that no schema can make because they need the model or the grader: an objective
// already met before the apprentice has done anything, more input functions asked for than the drive has
// inputs, wiring objectives the bench can never show, and hints no objective offers. Each problem names its
// place (a JSON path, which the editor turns into words) and says what to do in plain words. (check.ts already
// refuses devices, settings values and speeds that do not exist or cannot be reached.)
import { SUPPLY_VOLTS } from '../model/circuit/constants'
import { DIGITAL_INPUT_NUMBERS, digitalInputPoint } from '../model/points'
import { grade } from './grade'
import type { ObjectiveKind } from './objectiveSchema'
import type { Scenario } from './schema'

export interface AuthoringProblem {
  path: (string | number)[]
  message: string
}

/**
 * Objectives that ask the apprentice to bring something about. Met with nothing done, such an objective
 * gives its points away. The others are rules ("no trips", "locked before wiring", "no needless
 * replacement") that hold until broken, so they are met at the start by design.
 */
const ACHIEVEMENT_KINDS: readonly ObjectiveKind[] = [
  'settingEquals',
  'settingInRange',
  'wiringCondition',
  'functionalCheck',
  'speedHeld',
  'stoppedBy',
  'restartedWithRememberedReference',
  'absenceOfVoltageProved',
  'isolated',
  'faultFoundAndCleared',
]

/** Grades an attempt in which nothing is done and reports each achievement already met. */
export function objectivesMetAtStart(scenario: Scenario): AuthoringProblem[] {
  const result = grade(scenario, [], { endAt: 0 })
  const problems: AuthoringProblem[] = []
  scenario.objectives.forEach((objective, i) => {
    if (!ACHIEVEMENT_KINDS.includes(objective.kind)) return
    const met = result.objectives.find((o) => o.id === objective.id)?.met
    if (met)
      problems.push({
        path: ['objectives', i],
        message:
          'Already met at the start, before the apprentice does anything: change the starting state ' +
          '(for example start with the supply on and unlocked, or the setting at another value) or the objective.',
      })
  })
  return problems
}

/**
 * Objectives that need more distinct input functions (run, stop, raise …) than the drive has digital
 * inputs cannot all be met, whatever the apprentice wires.
 */
export function tooManyInputFunctions(scenario: Scenario): AuthoringProblem[] {
  const needed = new Set<string>()
  for (const objective of scenario.objectives)
    if (objective.kind === 'wiringCondition' && 'function' in objective.input)
      needed.add(objective.input.function)
  if (needed.size <= DIGITAL_INPUT_NUMBERS.length) return []
  return [
    {
      path: ['objectives'],
      message:
        `The objectives ask for ${needed.size} different input functions, but the drive has ` +
        `${DIGITAL_INPUT_NUMBERS.length} digital inputs: no wiring can meet them all.`,
    },
  ]
}

/** A hint no objective lists in its `hints` helps with nothing the scenario asks for. */
export function unattachedHints(scenario: Scenario): AuthoringProblem[] {
  const offered = new Set(scenario.objectives.flatMap((o) => o.hints ?? []))
  return scenario.hints.flatMap((hint, i) =>
    offered.has(hint.id)
      ? []
      : [
          {
            path: ['hints', i],
            message: 'No objective lists this hint: attach it to the objective it helps with, or remove it.',
          },
        ],
  )
}

const DIGITAL_INPUT_POINTS = new Set<string>(DIGITAL_INPUT_NUMBERS.map(digitalInputPoint))

/**
 * Wiring objectives the bench can never show, whatever the apprentice wires: a button held and released at
 * once, ON or OFF asked of a terminal that is not a digital input (only those read ON or OFF), and a voltage
 * window outside what the control circuit has (nothing below its common, nothing above the +24 V supply).
 */
export function impossibleObjectives(scenario: Scenario): AuthoringProblem[] {
  const problems: AuthoringProblem[] = []
  scenario.objectives.forEach((objective, i) => {
    if (objective.kind !== 'wiringCondition') return
    const add = (path: (string | number)[], message: string) =>
      problems.push({ path: ['objectives', i, ...path], message })
    const { held = [], released = [], nothingHeld } = objective.while
    const both = held.filter((id) => released.includes(id))
    if (both.length > 0)
      add(
        ['while', 'released'],
        `A button cannot be held and released at the same moment (${both.join(', ')}): keep it in one list.`,
      )
    if (nothingHeld && held.length > 0)
      add(
        ['while', 'nothingHeld'],
        'The objective asks for a button to be held and for nothing to be pressed at the same moment: ' +
          'drop one of the two.',
      )
    const { input, expect } = objective
    if (typeof expect === 'string') {
      if ('point' in input && !DIGITAL_INPUT_POINTS.has(input.point))
        add(
          ['expect'],
          'Only a digital input reads ON or OFF: choose a digital input, or ask for a voltage range instead.',
        )
      return
    }
    if (expect.minVolts > SUPPLY_VOLTS)
      add(
        ['expect', 'minVolts'],
        `No control terminal goes above the ${SUPPLY_VOLTS} V supply: lower the lowest voltage accepted.`,
      )
    if (expect.maxVolts < 0)
      add(
        ['expect', 'maxVolts'],
        'No control terminal goes below the common (0 V): raise the highest voltage accepted.',
      )
  })
  return problems
}

/** Every check above, for a scenario that has already passed the schema and the reference checks. */
export function authoringProblems(scenario: Scenario): AuthoringProblem[] {
  return [
    ...tooManyInputFunctions(scenario),
    ...impossibleObjectives(scenario),
    ...unattachedHints(scenario),
    ...objectivesMetAtStart(scenario),
  ]
}
