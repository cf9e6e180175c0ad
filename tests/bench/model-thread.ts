// Runs the model benchmark in a worker thread (bundled, plain node): where the server replays every log.
import { once } from 'node:events'
import { isMainThread, parentPort, Worker, type ResourceLimits } from 'node:worker_threads'
import { runModelBenchmark, type ModelBenchResult } from './model.bench'

/** The benchmark in a thread running this file's bundle with these heap limits (none: V8's defaults). */
export async function runModelBenchmarkInThread(
  bundledEntry: string,
  resourceLimits?: ResourceLimits,
): Promise<ModelBenchResult> {
  const worker = new Worker(bundledEntry, { execArgv: [], resourceLimits })
  const [result] = (await once(worker, 'message')) as [ModelBenchResult]
  await worker.terminate()
  return result
}

if (!isMainThread) parentPort!.postMessage(runModelBenchmark())
