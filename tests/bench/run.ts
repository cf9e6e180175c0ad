// `npm run bench`: every benchmark in one table. BENCH_ONLY=bundle,model,grade,live-grade,api,live,frame picks some.
// Needs the production build for bundle and frame (npm run build:client).
import { cpus, loadavg } from 'node:os'
import { runApiBench } from './api.bench'
import { runBundleBench } from './bundle.bench'
import { runFrameBench } from './frame.bench'
import { runGradeBenchmark, type GradeBenchResult } from './grade.bench'
import { runLiveGradeBenchmark, type LiveGradeBenchResult } from './live-grade.bench'
import { runLiveBench } from './live.bench'
import { GRADING_THREAD_RESOURCE_LIMITS } from '../../server/infrastructure/grading/thread-limits'
import { bundleFromSource } from '../../scripts/build'
import { type ModelBenchResult } from './model.bench'
import { runModelBenchmarkInThread } from './model-thread'
import { formatTable, type BenchRow } from './table'

/** The model in a grading thread (its heap limits), and the 10k replay again on a thread with V8's defaults. */
async function modelBench(): Promise<BenchRow[]> {
  const entry = await bundleFromSource('tests/bench/model-thread.ts')
  const inGradingThread = await runModelBenchmarkInThread(entry, GRADING_THREAD_RESOURCE_LIMITS)
  const withDefaults = await runModelBenchmarkInThread(entry)
  return [
    ...modelRows(inGradingThread),
    {
      group: 'model replay',
      name: "replay of 10k events on a thread with V8's default heap (for comparison)",
      value: withDefaults.tenThousandMs,
      unit: 'ms',
      baseline: { name: 'JSON.parse (median)', value: withDefaults.parseTenThousandMs },
    },
  ]
}

function modelRows(result: ModelBenchResult): BenchRow[] {
  const group = 'model replay'
  return [
    ...result.rows.map((row) => ({
      group,
      name: `${row.name} in a grading thread (median)`,
      value: row.ms,
      unit: 'ms',
      ...(row.events === 10_000 && row.simulatedMs > 3600_000 ? { target: '< 20 ms', met: row.ms < 20 } : {}),
    })),
    {
      group,
      name: 'replay of 10k events in a grading thread vs JSON.parse of its text',
      value: result.tenThousandMs,
      unit: 'ms',
      baseline: { name: 'JSON.parse (median)', value: result.parseTenThousandMs },
      target: '≤ 4× JSON.parse',
      met: result.tenThousandMs <= 4 * result.parseTenThousandMs,
    },
    {
      group,
      name: '100k vs 10k events',
      value: result.eventsRatio,
      unit: '×',
      target: '≤ 12×',
      met: result.eventsRatio <= 12,
    },
    {
      group,
      name: '10k events over 10 h vs over 1 min',
      value: result.durationRatio,
      unit: '×',
      target: '≤ 1.5×',
      met: result.durationRatio <= 1.5,
    },
  ]
}

function gradeRows(result: GradeBenchResult): BenchRow[] {
  const group = 'grade'
  const name = `grade() of a ${result.events}-event attempt`
  const baseline = (figure: string, value: number) => ({ name: `replay() ${figure}`, value })
  return [
    {
      group,
      name: `${name} (median)`,
      value: result.grade.medianMs,
      unit: 'ms',
      baseline: baseline('median', result.replay.medianMs),
    },
    {
      group,
      name: `${name} (p90)`,
      value: result.grade.p90Ms,
      unit: 'ms',
      baseline: baseline('p90', result.replay.p90Ms),
    },
    {
      group,
      name: `${name} (best)`,
      value: result.grade.bestMs,
      unit: 'ms',
      baseline: baseline('best', result.replay.bestMs),
    },
  ]
}

function liveGradeRows(result: LiveGradeBenchResult): BenchRow[] {
  const group = 'live grade'
  const at = (n: number) => `${n.toLocaleString('en')}-event log`
  return [
    {
      group,
      name: `one action (push + result) at a ${at(result.long.events)} (median)`,
      value: result.long.medianUs,
      unit: 'µs',
      baseline: { name: `same at a ${at(result.short.events)}`, value: result.short.medianUs },
      target: '≤ 1.5×',
      met: result.ratio <= 1.5,
    },
    {
      group,
      name: `one action at a ${at(result.long.events)} (p90)`,
      value: result.long.p90Us,
      unit: 'µs',
      baseline: { name: `same at a ${at(result.short.events)}`, value: result.short.p90Us },
    },
    {
      group,
      name: `whole-log grade() per action at a ${at(result.long.events)} (before: the panel's regrade)`,
      value: result.regrade.longMs,
      unit: 'ms',
      baseline: { name: `same at a ${at(result.short.events)}`, value: result.regrade.shortMs },
    },
  ]
}

const BENCHES: Record<string, () => BenchRow[] | Promise<BenchRow[]>> = {
  bundle: runBundleBench,
  model: modelBench,
  grade: () => gradeRows(runGradeBenchmark()),
  'live-grade': () => liveGradeRows(runLiveGradeBenchmark()),
  api: runApiBench,
  live: runLiveBench,
  frame: runFrameBench,
}

const only = process.env.BENCH_ONLY?.split(',').map((s) => s.trim())
const rows: BenchRow[] = []
const failures: string[] = []
for (const [name, run] of Object.entries(BENCHES)) {
  if (only && !only.includes(name)) continue
  const started = performance.now()
  try {
    rows.push(...(await run()))
    console.error(`${name}: done in ${((performance.now() - started) / 1000).toFixed(1)} s`)
  } catch (error) {
    failures.push(`${name}: ${(error as Error).message}`)
  }
}
console.log(formatTable(rows))
console.log(
  `\n${cpus().length} cores, load average ${loadavg()
    .map((l) => l.toFixed(2))
    .join(' ')} (figures from a shared machine vary with what else runs)`,
)
if (failures.length) {
  console.error(`\nbenchmarks that could not run:\n  ${failures.join('\n  ')}`)
  process.exitCode = 1
}
