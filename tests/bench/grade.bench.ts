// Grading benchmark: grade() of a long attempt (a fixture log padded to 2,000 events), the server-side
// cost of one submission (issue 8). The plain replay() of the same log is timed in the same run as a
// baseline: grading always includes one replay, so the ratio shows what grading adds on top of it.
// Run alone: npx tsx --tsconfig tsconfig.node.json tests/bench/grade.bench.ts
import { readFileSync } from 'node:fs'
import { cpus, loadavg } from 'node:os'
import { pathToFileURL } from 'node:url'
import { replay, type AttemptEvent } from '../../shared/model/index'
import { grade } from '../../shared/scenario/grade'
import { scenarioSchema, type Scenario } from '../../shared/scenario/schema'
import { toSimulationSetup } from '../../shared/scenario/setup'
import { fixtureLog, paddedLog } from './bulk-seed'

const SCENARIO = 'raise-lower-commissioning'
const EVENT_COUNT = 2000
/** Timed runs per round, and rounds: the best round is the least disturbed by other work on the machine. */
const RUNS = 200
const ROUNDS = 5
const WARM_UP_RUNS = 50

export interface TimingFigures {
  /** Median wall time of the best round (ms). */
  medianMs: number
  /** 90th percentile wall time of the best round (ms). */
  p90Ms: number
  /** Fastest single run (ms). */
  bestMs: number
  /** Median of every round's median: how a typical round went on this shared machine (ms). */
  medianOfRoundsMs: number
  /** Median CPU time of this process per run over all rounds (user + system, includes GC threads; ms). */
  cpuMedianMs: number
}

export interface GradeBenchResult {
  events: number
  grade: TimingFigures
  replay: TimingFigures
}

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * q))]!
}

function time(run: () => unknown): TimingFigures {
  for (let i = 0; i < WARM_UP_RUNS; i++) run()
  const rounds: { median: number; p90: number; best: number }[] = []
  const cpu: number[] = []
  for (let round = 0; round < ROUNDS; round++) {
    const times: number[] = []
    for (let i = 0; i < RUNS; i++) {
      const cpuStart = process.cpuUsage()
      const start = performance.now()
      run()
      times.push(performance.now() - start)
      const used = process.cpuUsage(cpuStart)
      cpu.push((used.user + used.system) / 1000)
    }
    times.sort((a, b) => a - b)
    rounds.push({ median: quantile(times, 0.5), p90: quantile(times, 0.9), best: times[0]! })
  }
  const best = rounds.reduce((a, b) => (b.median < a.median ? b : a))
  const medians = rounds.map((r) => r.median).sort((a, b) => a - b)
  return {
    medianMs: best.median,
    p90Ms: best.p90,
    bestMs: Math.min(...rounds.map((r) => r.best)),
    medianOfRoundsMs: quantile(medians, 0.5),
    cpuMedianMs: quantile(
      cpu.sort((a, b) => a - b),
      0.5,
    ),
  }
}

export function gradeBenchScenario(): Scenario {
  const path = new URL(`../../scenarios/${SCENARIO}.json`, import.meta.url)
  return scenarioSchema.parse(JSON.parse(readFileSync(path, 'utf8')))
}

export function runGradeBenchmark(): GradeBenchResult {
  const scenario = gradeBenchScenario()
  const events: AttemptEvent[] = paddedLog(fixtureLog(SCENARIO), EVENT_COUNT)
  const setup = toSimulationSetup(scenario)
  // The replay runs first, so the model's memos are warm for both figures.
  const replayFigures = time(() => replay(setup, events))
  const gradeFigures = time(() => grade(scenario, events))
  return { events: events.length, grade: gradeFigures, replay: replayFigures }
}

function printResult(result: GradeBenchResult): void {
  console.log(`Grading benchmark: ${SCENARIO} reference log padded to ${result.events} events`)
  console.log(
    `${ROUNDS} rounds of ${RUNS} runs after ${WARM_UP_RUNS} warm-up runs; median and p90 of the best round`,
  )
  console.log(
    `load average: ${loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')} on ${cpus().length} cores`,
  )
  const row = (figures: TimingFigures) => ({
    median: figures.medianMs.toFixed(2),
    p90: figures.p90Ms.toFixed(2),
    best: figures.bestMs.toFixed(2),
    'median of rounds': figures.medianOfRoundsMs.toFixed(2),
    'cpu median': figures.cpuMedianMs.toFixed(2),
  })
  console.table({ 'grade()': row(result.grade), 'replay() (baseline)': row(result.replay) })
  console.log(`grade / replay (medians): ×${(result.grade.medianMs / result.replay.medianMs).toFixed(2)}`)
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  printResult(runGradeBenchmark())
}
