// Runs in a grading thread (see grading-pool.ts), bundled as its own entry (dist/server/grading-worker.js).
// Three tasks, so that nothing proportional to a log's size runs on the event loop:
// - `read`: a submission's raw body → JSON parse, zod validation (the shared request schema), the
//   validated log serialised as the row stores it;
// - `grade`: a validated log replayed against a scenario version;
// - `injectable`: a live log replayed to the bench as it is now, and the faults it offers an instructor.
import { submitAttemptRequestSchema, type SubmitAttemptRequest } from '@shared/api/attempts'
import {
  applyEvent,
  createSimulation,
  ModelInputError,
  type AttemptEvent,
  type InjectedFault,
} from '@shared/model'
import type { ReferenceResult } from '@shared/api/scenarioAuthoring'
import { injectableFaults } from '@shared/scenario/injectable'
import { referenceResult } from '@shared/scenario/reference'
import { toSimulationSetup } from '@shared/scenario/setup'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Scenario } from '@shared/scenario/schema'
import { INVALID_JSON_MESSAGE, VALIDATION_MESSAGE, zodDetails } from '../../http-error'
import { gradeReport } from './grading'

export interface ReadTask {
  kind: 'read'
  /** The request body as received (null: no JSON body was sent, read as `{}` like express.json does). */
  body: Uint8Array | null
}

export interface GradeTask {
  kind: 'grade'
  scenarioId: string
  /** The scenario version's stored JSON document. */
  document: string
  /** The validated event log as JSON text. */
  eventsJson: string
  /** The attempt's assistance level (default standard): guided hints cost nothing. */
  assistance?: AssistanceLevel
}

/** Live classroom: the faults an instructor may inject into a bench as its live log leaves it now. */
export interface InjectableTask {
  kind: 'injectable'
  scenarioId: string
  document: string
  /** The live copy of the log so far, as JSON text. */
  eventsJson: string
}

/** Authoring: an author's reference run graded against a draft or a version (shared/scenario/reference.ts). */
export interface ReferenceTask {
  kind: 'reference'
  /** A scenario document that passed its checks, as JSON text. */
  document: string
  eventsJson: string
}

export type GradingTask = ReadTask | GradeTask | InjectableTask | ReferenceTask

/** A submission as validated, without its log (which travels as text). */
export type SubmissionHeader = Omit<SubmitAttemptRequest, 'events'>

export type ReadReport =
  | {
      ok: true
      request: SubmissionHeader
      /** The validated log serialised: what the attempt row stores, and what `grade` reads. */
      eventsJson: string
      eventCount: number
      hintRevealed: boolean
      /** What the live classroom put in the log, for the submission to check against its records. */
      live: LiveRecordsInLog
    }
  | { ok: false; code: 'invalid_json' | 'validation_failed'; message: string; details?: unknown }

/** The log's `fault.injected` and `message.received` events (few), without the rest of the log. */
export interface LiveRecordsInLog {
  injections: Extract<AttemptEvent, { type: 'fault.injected' }>[]
  messages: Extract<AttemptEvent, { type: 'message.received' }>[]
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

const decoder = new TextDecoder('utf-8')

/** The body as express.json reads it: empty → {}; only an object or array at the top (its `strict` mode). */
function parseBody(body: Uint8Array | null): { ok: true; value: unknown } | { ok: false } {
  if (body === null) return { ok: true, value: {} }
  const text = decoder.decode(body)
  const first = /\S/.exec(text)?.[0]
  if (first === undefined) return { ok: true, value: {} }
  if (first !== '{' && first !== '[') return { ok: false }
  try {
    return { ok: true, value: JSON.parse(text) }
  } catch {
    return { ok: false }
  }
}

export function readSubmission(body: Uint8Array | null): ReadReport {
  const json = parseBody(body)
  if (!json.ok) return { ok: false, code: 'invalid_json', message: INVALID_JSON_MESSAGE }
  const result = submitAttemptRequestSchema.safeParse(json.value)
  if (!result.success) {
    return {
      ok: false,
      code: 'validation_failed',
      message: VALIDATION_MESSAGE,
      details: zodDetails(result.error),
    }
  }
  const { events, ...request } = result.data
  return {
    ok: true,
    request,
    eventsJson: JSON.stringify(events),
    eventCount: events.length,
    hintRevealed: events.some((e) => e.type === 'hint.revealed'),
    live: {
      injections: events.filter((e) => e.type === 'fault.injected'),
      messages: events.filter((e) => e.type === 'message.received'),
    },
  }
}

/** A grade as the attempt row stores it: the evidence already serialised, in the thread. */
export type LogGradeReport =
  { ok: true; score: number; passed: boolean; evidenceJson: string } | { ok: false; inputError: string }

export function gradeLog(task: Omit<GradeTask, 'kind'>): LogGradeReport {
  const report = gradeReport(scenarioOf(task), JSON.parse(task.eventsJson) as AttemptEvent[], task.assistance)
  if (!report.ok) return report
  const { score, passed, evidence } = report.outcome
  return { ok: true, score, passed, evidenceJson: JSON.stringify(evidence) }
}

export type InjectableReport = { ok: true; faults: InjectedFault[] } | { ok: false; inputError: string }

/** The bench as the log leaves it, and the catalogue of faults it offers (shared/scenario/injectable.ts). */
export function injectableNow(task: Omit<InjectableTask, 'kind'>): InjectableReport {
  try {
    let state = createSimulation(toSimulationSetup(scenarioOf(task)))
    for (const event of JSON.parse(task.eventsJson) as AttemptEvent[]) state = applyEvent(state, event)
    return { ok: true, faults: injectableFaults(state).map((entry) => entry.fault) }
  } catch (error) {
    if (error instanceof ModelInputError) return { ok: false, inputError: error.message }
    throw error
  }
}

export default function runTask(
  task: GradingTask,
): ReadReport | LogGradeReport | InjectableReport | ReferenceResult {
  if (task.kind === 'read') return readSubmission(task.body)
  if (task.kind === 'reference')
    return referenceResult(
      JSON.parse(task.document) as Scenario,
      JSON.parse(task.eventsJson) as AttemptEvent[],
    )
  return task.kind === 'grade' ? gradeLog(task) : injectableNow(task)
}
