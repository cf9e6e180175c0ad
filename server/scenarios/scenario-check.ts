// Semantic checks of a scenario (points exist, settings in the catalogue, objectives attainable) through
// the shared checkScenario, reported as per-field errors keyed by JSON path.
import { checkScenario } from '@shared/scenario/check'
import type { Scenario } from '@shared/scenario/schema'
import { HttpError } from '../http-error'

export function checkScenarioDocument(document: Scenario, pathPrefix = ''): void {
  const result = checkScenario(document)
  if (result.ok) return
  const fields: Record<string, string[]> = {}
  for (const problem of result.problems)
    (fields[problem.path.replace(/^\$/, '$' + pathPrefix)] ??= []).push(problem.message)
  throw new HttpError(400, 'scenario_invalid', 'The scenario has problems; nothing was saved', { fields })
}
