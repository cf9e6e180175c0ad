// Checks of a scenario that no schema can make because they need the model or the grader: an objective
// already met before the apprentice has done anything, and more input functions asked for than the
// drive has inputs. Each problem names its place (a JSON path, which the
// editor turns into words) and says what to do in plain words.
import { DIGITAL_INPUT_NUMBERS } from '../model/points'
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

/** Every check above, for a scenario that has already passed the schema and the reference checks. */
export function authoringProblems(scenario: Scenario): AuthoringProblem[] {
  return [...tooManyInputFunctions(scenario), ...objectivesMetAtStart(scenario)]
}
