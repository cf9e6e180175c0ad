// Live grading benchmark (issue 14): what handling one action costs the panel — append the event to
// the live grader and read the result as of now — at the end of a 10,000-event attempt, against the
// same at a 100-event attempt, measured in the same run. Both logs are the raise/lower reference
// solution padded with meter-probe moves, so they end in the same state and take the same actions.
// For contrast, the whole-log regrade the panel used to do per action is timed at both lengths too.
// Run alone: npx tsx --tsconfig tsconfig.node.json tests/bench/live-grade.bench.ts
import { cpus, loadavg } from 'node:os'
import { pathToFileURL } from 'node:url'
import type { AttemptEvent } from '../../shared/model/index'
import { grade } from '../../shared/scenario/grade'
import { createLiveGrader, type LiveGrader } from '../../shared/scenario/liveGrader'
import { fixtureLog, paddedLog } from './bulk-seed'
import { gradeBenchScenario } from './grade.bench'

const SCENARIO = 'raise-lower-commissioning'
const SHORT = 100
const LONG = 10_000
/** Actions per round and rounds; the lengths take turns, so load on the machine falls on both alike. */
const ACTIONS = 300
const ROUNDS = 6
const WARM_UP_ACTIONS = 300
const REGRADE_RUNS = 15

type Untimed = AttemptEvent extends infer E ? (E extends AttemptEvent ? Omit<E, 't'> : never) : never

/** What an apprentice does at the panel, over and over: probes, keypad, the raise and lower buttons. */
const CYCLE: Untimed[] = [
  { type: 'meter.probes', red: 'drive.p24', black: 'drive.0v' },
  { type: 'keypad.key', key: 'down' },
  { type: 'device.pressed', device: 'raiseButton' },
  { type: 'meter.probes', red: 'drive.di2', black: 'drive.0v' },
  { type: 'device.released', device: 'raiseButton' },
  { type: 'keypad.key', key: 'up' },
  { type: 'device.pressed', device: 'lowerButton' },
  { type: 'meter.probes', red: null, black: null },
  { type: 'device.released', device: 'lowerButton' },
]

export interface ActionFigures {
  events: number
  /** Median and 90th percentile of one action's wall time (µs). */
  medianUs: number
  p90Us: number
}

export interface LiveGradeBenchResult {
  short: ActionFigures
  long: ActionFigures
  /** long.medianUs / short.medianUs: the target is ≤ 1.5. */
  ratio: number
  /** The old way: grade() of the whole log per action (median ms), at both lengths. */
  regrade: { shortMs: number; longMs: number }
}

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * q))]!
}

/** A grader over a padded log, with the drive switched on to run, and its clock. */
function liveAt(count: number) {
  const scenario = gradeBenchScenario()
  const events = paddedLog(fixtureLog(SCENARIO), count).filter((e) => e.type !== 'attempt.ended')
  let t = events[events.length - 1]!.t + 1000
  events.push({ t, type: 'device.switched', device: 'runSwitch', position: 1 })
  const grader: LiveGrader = createLiveGrader(scenario, events)
  let next = 0
  return {
    events: events.length,
    log: events,
    /** Handles the next action as the panel does; returns its wall time (µs). */
    act(): number {
      t += 700
      const event = { ...CYCLE[next++ % CYCLE.length]!, t } as AttemptEvent
      const start = performance.now()
      grader.push(event)
      grader.result(t)
      return (performance.now() - start) * 1000
    },
  }
}

export function runLiveGradeBenchmark(): LiveGradeBenchResult {
  const short = liveAt(SHORT)
  const long = liveAt(LONG)
  for (let i = 0; i < WARM_UP_ACTIONS; i++) {
    short.act()
    long.act()
  }
  const times = { short: [] as number[], long: [] as number[] }
  for (let round = 0; round < ROUNDS; round++) {
    for (const [name, live] of round % 2 === 0
      ? ([
          ['short', short],
          ['long', long],
        ] as const)
      : ([
          ['long', long],
          ['short', short],
        ] as const)) {
      for (let i = 0; i < ACTIONS; i++) times[name].push(live.act())
    }
  }
  const figures = (name: 'short' | 'long', events: number): ActionFigures => {
    const sorted = times[name].sort((a, b) => a - b)
    return { events, medianUs: quantile(sorted, 0.5), p90Us: quantile(sorted, 0.9) }
  }
  const shortFigures = figures('short', SHORT)
  const longFigures = figures('long', LONG)

  // The whole-log regrade per action, as the panel did it before (few runs: it is slow at 10,000).
  const scenario = gradeBenchScenario()
  const regrade = (log: AttemptEvent[]) => {
    const runs: number[] = []
    for (let i = 0; i < REGRADE_RUNS; i++) {
      const start = performance.now()
      grade(scenario, log, { endAt: log[log.length - 1]!.t + 700 })
      runs.push(performance.now() - start)
    }
    return quantile(
      runs.sort((a, b) => a - b),
      0.5,
    )
  }
  return {
    short: shortFigures,
    long: longFigures,
    ratio: longFigures.medianUs / shortFigures.medianUs,
    regrade: { shortMs: regrade(short.log), longMs: regrade(long.log) },
  }
}

function printResult(result: LiveGradeBenchResult): void {
  console.log(`Live grading benchmark: ${SCENARIO} reference log padded to ${SHORT} and ${LONG} events`)
  console.log(
    `load average: ${loadavg()
      .map((l) => l.toFixed(2))
      .join(' ')} on ${cpus().length} cores`,
  )
  console.table({
    [`${result.short.events} events`]: {
      'median µs': result.short.medianUs.toFixed(1),
      'p90 µs': result.short.p90Us.toFixed(1),
    },
    [`${result.long.events} events`]: {
      'median µs': result.long.medianUs.toFixed(1),
      'p90 µs': result.long.p90Us.toFixed(1),
    },
  })
  console.log(
    `one action at ${LONG} / at ${SHORT} events (medians): ×${result.ratio.toFixed(2)} (target ≤ 1.5)`,
  )
  console.log(
    `whole-log regrade per action: ${result.regrade.shortMs.toFixed(2)} ms / ${result.regrade.longMs.toFixed(2)} ms`,
  )
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  printResult(runLiveGradeBenchmark())
}
