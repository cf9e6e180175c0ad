// The script of a worker thread. The built server has each beside its own bundle (dist/server/<name>.js).
// Running from TypeScript (npm run dev, the tests), the build script bundles it on first use, so a thread
// always runs plain JavaScript: no thread ever loads TypeScript through a loader's module hooks.
import { existsSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { APP_ROOT } from './paths'

const here = fileURLToPath(import.meta.url)

/** Worker entries, by their bundle name (scripts/build.ts builds each as its own file). */
export const WORKER_SOURCES = {
  'grading-worker': 'server/infrastructure/grading/grading-worker.ts',
  'sqlite-checkpointer': 'server/infrastructure/database/sqlite-checkpointer.ts',
} as const

export async function workerFile(name: keyof typeof WORKER_SOURCES): Promise<string> {
  if (!here.endsWith('.ts')) {
    // Bundled: beside this bundle, or (a benchmark's own bundle) in the server build.
    const beside = join(dirname(here), `${name}.js`)
    return existsSync(beside) ? beside : join(APP_ROOT, 'dist/server', `${name}.js`)
  }
  // A path the bundler cannot follow: the build script (and esbuild) stay out of the production bundle.
  const buildScript = resolve(dirname(here), '../../scripts/build.ts')
  const build = (await import(/* @vite-ignore */ buildScript)) as typeof import('../../scripts/build')
  return build.bundleFromSource(WORKER_SOURCES[name])
}
