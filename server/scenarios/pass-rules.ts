// Each scenario version's pass rule (pass mark as a score, required objectives), read from its document.
import { In, type DataSource, type EntityManager } from 'typeorm'
import { passRule } from '@shared/progress'
import { ScenarioEntity } from '../entities'

export interface PassRule {
  /** Out of 100; null when the document cannot be read. */
  passMark: number | null
  requiredObjectives: number
}

export const UNKNOWN_RULE: PassRule = { passMark: null, requiredObjectives: 0 }

/** One query for every version named. */
export async function passRulesOf(
  ds: DataSource | EntityManager,
  scenarioIds: string[],
): Promise<Map<string, PassRule>> {
  const rows = scenarioIds.length
    ? await ds.getRepository(ScenarioEntity).find({
        where: { id: In([...new Set(scenarioIds)]) },
        select: { id: true, document: true },
      })
    : []
  const rules = new Map<string, PassRule>()
  for (const row of rows) {
    try {
      rules.set(row.id, passRule(JSON.parse(row.document)))
    } catch {
      rules.set(row.id, UNKNOWN_RULE)
    }
  }
  return rules
}
