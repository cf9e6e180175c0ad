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
/** Each shipped scenario's reference solution, which the server stores with the scenario (issue 17). */
export const REFERENCE_SOLUTIONS_DIR = join(root, 'scenarios/reference-solutions')

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

/** `{ events }` as scenarios/reference-solutions/<key>.json holds it, one event per line. */
export function serialiseReferenceSolution(events: AttemptEvent[]): string {
  return `{\n  "events": [\n${events.map((e) => `    ${JSON.stringify(e)}`).join(',\n')}\n  ]\n}\n`
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
  mkdirSync(REFERENCE_SOLUTIONS_DIR, { recursive: true })
  // Written in the project's Prettier style so `npm run format` leaves the logs alone.
  const write = async (file: string, text: string) =>
    writeFileSync(file, await format(text, { ...((await resolveConfig(file)) ?? {}), filepath: file }))
  for (const script of ATTEMPT_SCRIPTS) {
    const fixture = buildFixture(script)
    await write(join(ATTEMPTS_DIR, fixtureFileName(script)), serialiseFixture(fixture))
    if (script.name === 'reference')
      await write(
        join(REFERENCE_SOLUTIONS_DIR, `${script.scenario}.json`),
        serialiseReferenceSolution(fixture.events),
      )
    console.log(
      `${fixtureFileName(script)}: ${fixture.events.length} events, ends at ${fixture.events.at(-1)?.t} ms`,
    )
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) await main()
