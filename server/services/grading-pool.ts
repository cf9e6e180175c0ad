// Grading off the request thread. Replaying a long attempt costs milliseconds of pure computation; on the
// event loop it would hold up every other request (a gradebook page, a sign-in) for that long. A pool of
// worker threads (piscina) grades instead, and the event loop only parses, checks and stores. With no
// threads (tests inside Vitest, or GRADING_THREADS=0) the same task runs inline.
import { Piscina } from 'piscina'
import { outcomeOf, type GradeOutcome } from './grading'
import gradeTask, { type GradeTask } from './grading-worker'

export interface GradingPool {
  /** Grades a validated log, given as its JSON text. */
  grade(scenario: { id: string; document: string }, eventsJson: string): Promise<GradeOutcome>
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
      grade: async (scenario, eventsJson) =>
        outcomeOf(gradeTask({ scenarioId: scenario.id, document: scenario.document, eventsJson })),
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
    async grade(scenario, eventsJson) {
      return outcomeOf(await pool.run({ scenarioId: scenario.id, document: scenario.document, eventsJson }))
    },
    close: () => pool.close(),
    threads,
  }
}
