// Small scenarios and attempt builders for the objective tests.
import { readFileSync } from 'node:fs'
import { resolve } from 'node:path'
import {
  checkScenario,
  grade,
  toSimulationSetup,
  type Objective,
  type ObjectiveResult,
  type Scenario,
} from '@shared/scenario'
import type { AttemptFixture } from '../../support/shipped-attempts'
import { LogBuilder } from './builders/logBuilder'

/** The stored attempt logs (tests/fixtures/attempts), in file-name order. */
export { attemptFixtures } from '../../support/shipped-attempts'

const scenariosDir = resolve(import.meta.dirname, '../../../scenarios')

/** The scenario ids that have stored attempt logs. */
export function fixtureScenarioIds(fixtures: readonly AttemptFixture[]): string[] {
  return [...new Set(fixtures.map((f) => f.scenario))]
}

export function shippedScenario(id: string): Scenario {
  const result = checkScenario(JSON.parse(readFileSync(resolve(scenariosDir, `${id}.json`), 'utf8')))
  if (!result.ok) throw new Error(`${id}: ${JSON.stringify(result.problems)}`)
  return result.scenario
}

/** The Brindlecross conveyor (raise/lower wired and programmed, powered) with the given objectives. */
export function benchScenario(objectives: Objective[], edit: (s: Scenario) => void = () => {}): Scenario {
  const scenario = structuredClone(shippedScenario('reference-memory'))
  scenario.objectives = objectives
  scenario.passMark = 0
  scenario.start.settings['raiseLower.memoryAtStop'] = 'keep'
  edit(scenario)
  // The bench's hints (the conveyor's own, or a test's) go beside the first objective: a hint must help with one.
  const listed = new Set(scenario.objectives.flatMap((o) => o.hints ?? []))
  const loose = scenario.hints.map((h) => h.id).filter((id) => !listed.has(id))
  if (loose.length > 0 && scenario.objectives.length > 0) {
    const [first, ...rest] = scenario.objectives
    scenario.objectives = [{ ...first, hints: [...(first.hints ?? []), ...loose] }, ...rest]
  }
  const checked = checkScenario(scenario)
  if (!checked.ok) throw new Error(JSON.stringify(checked.problems))
  return checked.scenario
}

export function builderFor(scenario: Scenario): LogBuilder {
  return new LogBuilder(toSimulationSetup(scenario))
}

/** Grade a scenario with one objective and return that objective's result. */
export function judge(scenario: Scenario, build: (b: LogBuilder) => void): ObjectiveResult {
  const b = builderFor(scenario)
  build(b)
  return grade(scenario, b.end()).objectives[0]
}

export const ready = (b: LogBuilder) =>
  b.waitUntil((d) => d.power === 'ready', 'the drive becoming ready').wait(1000)
export const atSpeed = (d: { control: string }) => d.control === 'atSpeed'
export const stopped = (d: { control: string }) => d.control === 'stopped'
