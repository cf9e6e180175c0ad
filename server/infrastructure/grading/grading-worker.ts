// Runs in a grading thread (see grading-pool.ts): one task = one log graded against one scenario version.
import type { AttemptEvent } from '@shared/model'
import type { Scenario } from '@shared/scenario/schema'
import { gradeReport, type GradeReport } from './grading'

export interface GradeTask {
  scenarioId: string
  /** The scenario version's stored JSON document. */
  document: string
  /** The validated event log as JSON text (parsed here, off the event loop). */
  eventsJson: string
}

// Scenario versions are parsed once per thread; the document is compared so an edited draft is re-read.
const parsed = new Map<string, { document: string; scenario: Scenario }>()

export function scenarioOf(task: Pick<GradeTask, 'scenarioId' | 'document'>): Scenario {
  const cached = parsed.get(task.scenarioId)
  if (cached?.document === task.document) return cached.scenario
  const scenario = JSON.parse(task.document) as Scenario
  if (parsed.size >= 200) parsed.clear()
  parsed.set(task.scenarioId, { document: task.document, scenario })
  return scenario
}

export default function gradeTask(task: GradeTask): GradeReport {
  return gradeReport(scenarioOf(task), JSON.parse(task.eventsJson) as AttemptEvent[])
}
