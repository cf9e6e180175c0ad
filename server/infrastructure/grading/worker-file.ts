// The grading thread's script. The built server has it beside its own bundle (dist/server/grading-worker.js).
// Running from TypeScript (npm run dev, the tests), the build script bundles it on first use, so a grading
// thread always runs plain JavaScript: no thread ever loads TypeScript through a loader's module hooks.
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'

const here = fileURLToPath(import.meta.url)

export async function gradingWorkerFile(): Promise<string> {
  if (here.endsWith('.js')) return join(dirname(here), 'grading-worker.js')
  // A path the bundler cannot follow: the build script (and esbuild) stay out of the production bundle.
  const buildScript = resolve(dirname(here), '../../../scripts/build.ts')
  const build = (await import(/* @vite-ignore */ buildScript)) as typeof import('../../../scripts/build')
  return build.bundleGradingWorker()
}
