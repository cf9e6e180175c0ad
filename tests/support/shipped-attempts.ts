// The shipped scenarios and the stored attempt fixtures (tests/fixtures/attempts), with the model state
// at the start and at the end of an attempt: what the schematic and the records tests draw from.
import { readFileSync, readdirSync } from 'node:fs'
import { resolve } from 'node:path'
import { applyEvent, createSimulation, type AttemptEvent, type SimState } from '../../shared/model'
import { checkScenario, toSimulationSetup, type Scenario } from '../../shared/scenario'

const root = resolve(import.meta.dirname, '../..')

export interface AttemptFixture {
  scenario: string
  scenarioVersion: number
  name: string
  description: string
  misses: string[]
  events: AttemptEvent[]
}

export function shippedScenarios(): Scenario[] {
  return readdirSync(resolve(root, 'scenarios'))
    .filter((f) => f.endsWith('.json'))
    .sort()
    .map((f) => {
      const checked = checkScenario(JSON.parse(readFileSync(resolve(root, 'scenarios', f), 'utf8')))
      if (!checked.ok) throw new Error(`${f}: ${JSON.stringify(checked.problems)}`)
      return checked.scenario
    })
}

export function attemptFixtures(filter: (name: string) => boolean = () => true): AttemptFixture[] {
  const dir = resolve(root, 'tests/fixtures/attempts')
  return readdirSync(dir)
    .filter((f) => f.endsWith('.json') && filter(f.replace(/\.json$/, '')))
    .sort()
    .map((f) => JSON.parse(readFileSync(resolve(dir, f), 'utf8')) as AttemptFixture)
}

/** Every scenario's reference solution (`<scenario>--reference.json`). */
export function referenceFixtures(): AttemptFixture[] {
  return attemptFixtures((name) => name.endsWith('--reference'))
}

export function scenarioById(id: string): Scenario {
  const found = shippedScenarios().find((s) => s.id === id)
  if (!found) throw new Error(`no shipped scenario ${id}`)
  return found
}

export function startState(scenario: Scenario): SimState {
  return createSimulation(toSimulationSetup(scenario))
}

export function endState(scenario: Scenario, events: readonly AttemptEvent[]): SimState {
  return events.reduce(applyEvent, startState(scenario))
}
