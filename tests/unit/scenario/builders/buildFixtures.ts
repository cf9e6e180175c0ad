// Regenerates the attempt logs in tests/fixtures/attempts/ from the scripts in builders/attempts.ts:
//   npm run fixtures:build
// The logs are kept as data so the server, panel and grading tests can all replay the same attempts.
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { format, resolveConfig } from 'prettier'
import { checkScenario, toSimulationSetup } from '@shared/scenario'
import type { AttemptEvent } from '@shared/model'
import { ATTEMPT_SCRIPTS, type AttemptScript } from './attempts'
import { LogBuilder } from './logBuilder'

export interface AttemptFixture {
  scenario: string
  scenarioVersion: number
  name: string
  description: string
  misses: string[]
  /** How many healthy parts the log replaces (each costs the noNeedlessReplacements objective points). */
  needless?: number
  events: AttemptEvent[]
}

const root = resolve(import.meta.dirname, '../../../..')
export const ATTEMPTS_DIR = join(root, 'tests/fixtures/attempts')

export function fixtureFileName(script: Pick<AttemptScript, 'scenario' | 'name'>): string {
  return `${script.scenario}--${script.name}.json`
}

export function buildFixture(script: AttemptScript): AttemptFixture {
  const result = checkScenario(
    JSON.parse(readFileSync(join(root, 'scenarios', `${script.scenario}.json`), 'utf8')),
  )
  if (!result.ok) throw new Error(`${script.scenario}: ${JSON.stringify(result.problems)}`)
  const builder = new LogBuilder(toSimulationSetup(result.scenario))
  script.build(builder)
  return {
    scenario: script.scenario,
    scenarioVersion: result.scenario.version,
    name: script.name,
    description: script.description,
    misses: script.misses,
    ...(script.needless ? { needless: script.needless } : {}),
    events: builder.end(),
  }
}

/** One event per line: diffs of a regenerated log stay readable. */
export function serialiseFixture(fixture: AttemptFixture): string {
  const { events, ...head } = fixture
  const fields = Object.entries(head).map(
    ([key, value]) => `  ${JSON.stringify(key)}: ${JSON.stringify(value)}`,
  )
  const lines = events.map((e) => `    ${JSON.stringify(e)}`).join(',\n')
  return `{\n${fields.join(',\n')},\n  "events": [\n${lines}\n  ]\n}\n`
}

async function main(): Promise<void> {
  mkdirSync(ATTEMPTS_DIR, { recursive: true })
  for (const script of ATTEMPT_SCRIPTS) {
    const fixture = buildFixture(script)
    const file = join(ATTEMPTS_DIR, fixtureFileName(script))
    // Written in the project's Prettier style so `npm run format` leaves the logs alone.
    const options = (await resolveConfig(file)) ?? {}
    writeFileSync(file, await format(serialiseFixture(fixture), { ...options, filepath: file }))
    console.log(
      `${fixtureFileName(script)}: ${fixture.events.length} events, ends at ${fixture.events.at(-1)?.t} ms`,
    )
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) await main()
