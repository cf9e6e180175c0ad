// Grading, optionally off the request thread. Replaying a long attempt costs milliseconds of pure
// computation; on the event loop it holds up every other request for that long. With GRADING_THREADS > 0 a
// pool of worker threads (piscina) grades instead; with 0 (the default, see config.ts) it runs inline.
import { Piscina } from 'piscina'
import type { AttemptEvent } from '@shared/model'
import { gradeReport, outcomeOf, type GradeOutcome } from './grading'
import gradeTask, { scenarioOf, type GradeTask } from './grading-worker'

/** A validated log, as objects (graded inline) and as the JSON text the row stores (sent to a thread). */
export interface GradableLog {
  events: AttemptEvent[]
  json: string
}

export interface GradingPool {
  grade(scenario: { id: string; document: string }, log: GradableLog): Promise<GradeOutcome>
  /** Waits for running tasks, then stops the threads. */
  close(): Promise<void>
  readonly threads: number
}

const WORKER = new URL('./grading-worker.ts', import.meta.url).href

export interface GradingPoolOptions {
  threads: number
  /** How threads load TypeScript: the parent's own flags by default (tsx's loader in every start script). */
  execArgv?: string[]
}

export function createGradingPool({ threads, execArgv }: GradingPoolOptions): GradingPool {
  if (threads === 0) {
    return {
      grade: async (scenario, log) =>
        outcomeOf(
          gradeReport(scenarioOf({ scenarioId: scenario.id, document: scenario.document }), log.events),
        ),
      close: async () => {},
      threads: 0,
    }
  }
  const pool = new Piscina<GradeTask, ReturnType<typeof gradeTask>>({
    filename: WORKER,
    minThreads: threads,
    maxThreads: threads,
    execArgv: execArgv ?? process.execArgv,
    // Threads stay up: starting one (loading the model under tsx) costs far more than a grade.
    idleTimeout: Number.POSITIVE_INFINITY,
  })
  return {
    async grade(scenario, log) {
      const task = { scenarioId: scenario.id, document: scenario.document, eventsJson: log.json }
      return outcomeOf(await pool.run(task))
    },
    close: () => pool.close(),
    threads,
  }
}
