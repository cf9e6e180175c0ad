// Runs in a grading thread (see grading-pool.ts), bundled as its own entry (dist/server/grading-worker.js).
// Two tasks, so that nothing proportional to a log's size runs on the event loop:
// - `read`: a submission's raw body → JSON parse, zod validation (the shared request schema), the
//   validated log serialised as the row stores it;
// - `grade`: a validated log replayed against a scenario version.
import { submitAttemptRequestSchema, type SubmitAttemptRequest } from '@shared/api/attempts'
import type { AttemptEvent } from '@shared/model'
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

export type GradingTask = ReadTask | GradeTask

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

export default function runTask(task: GradingTask): ReadReport | LogGradeReport {
  return task.kind === 'read' ? readSubmission(task.body) : gradeLog(task)
}
