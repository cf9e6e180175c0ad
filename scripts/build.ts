// Builds what production runs: the client with Vite into dist/client, the server with esbuild into
// dist/server (plain JavaScript ES modules; packages from node_modules stay imports, so native modules and
// data files load from the production install). `tsx scripts/build.ts [client] [server] [--if-stale]`.
import { createHash } from 'node:crypto'
import { spawnSync } from 'node:child_process'
import {
  existsSync,
  mkdirSync,
  readdirSync,
  readFileSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs'
import { dirname, join, relative, resolve } from 'node:path'
import { pathToFileURL } from 'node:url'
import type { BuildOptions, OutputFile } from 'esbuild'
import { WORKER_SOURCES } from '../server/infrastructure/worker-file'

export const ROOT = resolve(import.meta.dirname, '..')
export const SERVER_OUT = join(ROOT, 'dist/server')
const CLIENT_INDEX = join(ROOT, 'dist/client/index.html')
/**
 * Written last, with the time the build started: a build cut off half-way is still stale, and so is one
 * whose sources were edited while it ran.
 */
const SERVER_STAMP = join(SERVER_OUT, 'build-stamp.json')

/** The bundles an operator runs, and each worker thread's own entry (threads load them by file). */
export const SERVER_ENTRIES = {
  index: 'server/index.ts',
  start: 'server/scripts/start.ts',
  // The operator commands (npm run admin:create, npm run db:reset; scripts/operator.mjs runs them).
  'admin-create': 'server/scripts/admin-create.ts',
  'db-reset': 'server/scripts/db-reset.ts',
  ...WORKER_SOURCES,
}

const SERVER_SOURCES = ['server', 'shared', 'scripts/build.ts', 'package.json', 'tsconfig.node.json']
const CLIENT_SOURCES = ['src', 'shared', 'index.html', 'vite.config.ts', 'package.json', 'public']

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0
  const stat = statSync(path)
  if (!stat.isDirectory()) return stat.mtimeMs
  return readdirSync(path).reduce(
    (newest, name) => Math.max(newest, newestMtime(join(path, name))),
    stat.mtimeMs,
  )
}

const builtAt = (file: string) => (existsSync(file) ? statSync(file).mtimeMs : 0)
const sourcesAt = (sources: string[]) => Math.max(...sources.map((s) => newestMtime(join(ROOT, s))))
const serverBuiltFrom = () =>
  existsSync(SERVER_STAMP)
    ? (JSON.parse(readFileSync(SERVER_STAMP, 'utf8')) as { sourcesBefore: number }).sourcesBefore
    : 0

export const serverIsStale = () => serverBuiltFrom() < sourcesAt(SERVER_SOURCES)
export const clientIsStale = () => builtAt(CLIENT_INDEX) < sourcesAt(CLIENT_SOURCES)

function esbuildOptions(entryPoints: Record<string, string>): BuildOptions {
  return {
    entryPoints: Object.fromEntries(Object.entries(entryPoints).map(([k, v]) => [k, join(ROOT, v)])),
    absWorkingDir: ROOT,
    bundle: true,
    platform: 'node',
    format: 'esm',
    target: 'node20',
    // node_modules are imported at run time, not bundled: native modules (better-sqlite3, argon2) and
    // packages that read their own files (pdfmake, fonts) keep working from `npm ci --omit=dev`.
    packages: 'external',
    // The @shared alias comes from this tsconfig's paths.
    tsconfig: join(ROOT, 'tsconfig.node.json'),
    // TypeORM names migrations after their classes.
    keepNames: true,
    sourcemap: 'linked',
    write: false,
    logLevel: 'warning',
  }
}

/** Writes each file through a temporary name, so a concurrent build or a running reader never sees half a file. */
function writeAtomically(files: OutputFile[]) {
  for (const file of files) {
    mkdirSync(dirname(file.path), { recursive: true })
    const temporary = `${file.path}.${process.pid}.tmp`
    writeFileSync(temporary, file.contents)
    renameSync(temporary, file.path)
  }
}

export async function buildServer(): Promise<void> {
  const { build } = await import('esbuild')
  const started = performance.now()
  const startedAt = Date.now()
  const result = await build({ ...esbuildOptions(SERVER_ENTRIES), outdir: SERVER_OUT })
  writeAtomically(result.outputFiles!)
  const written = new Set(result.outputFiles!.map((f) => f.path))
  for (const name of readdirSync(SERVER_OUT)) {
    const path = join(SERVER_OUT, name)
    if (!written.has(path) && path !== SERVER_STAMP && !name.endsWith('.tmp')) rmSync(path, { force: true })
  }
  writeFileSync(SERVER_STAMP, JSON.stringify({ sourcesBefore: startedAt }) + '\n')
  console.error(
    `server built into ${relative(process.cwd(), SERVER_OUT) || '.'} in ${(performance.now() - started).toFixed(0)} ms`,
  )
}

export function buildClient(): void {
  const vite = join(ROOT, 'node_modules/vite/bin/vite.js')
  const result = spawnSync(process.execPath, [vite, 'build'], { cwd: ROOT, stdio: 'inherit' })
  if (result.status !== 0) throw new Error(`vite build failed (exit ${result.status})`)
}

/** The server build when its sources changed since (tests and benchmarks run the built server). */
export async function ensureServerBuild(): Promise<void> {
  if (serverIsStale()) await buildServer()
}

/**
 * One TypeScript file bundled the way the server is, for code that must run as plain JavaScript without
 * a full build (the grading thread under npm run dev and the tests; benchmark baselines). Named by content,
 * so concurrent test processes share one file and an edit gives a new one.
 */
export async function bundleFromSource(entry: string): Promise<string> {
  const { build } = await import('esbuild')
  const name = entry.replace(/^.*\//, '').replace(/\.ts$/, '')
  const result = await build({ ...esbuildOptions({ [name]: entry }), sourcemap: 'inline', outdir: SERVER_OUT })
  const code = result.outputFiles!.find((f) => f.path.endsWith('.js'))!
  const hash = createHash('sha256').update(code.contents).digest('hex').slice(0, 16)
  // Under node_modules, so the bundle's package imports resolve from the project's node_modules.
  const path = join(ROOT, 'node_modules/.cache/slipway', `${name}-${hash}.mjs`)
  if (!existsSync(path)) writeAtomically([{ ...code, path }])
  return path
}


async function main(args: string[]) {
  const ifStale = args.includes('--if-stale')
  const targets = args.filter((a) => !a.startsWith('--'))
  const wants = (target: string) => targets.length === 0 || targets.includes(target)
  if (wants('client') && (!ifStale || clientIsStale())) {
    console.error(existsSync(CLIENT_INDEX) ? 'Building the client (sources changed)…' : 'Building the client…')
    buildClient()
  }
  if (wants('server') && (!ifStale || serverIsStale())) await buildServer()
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  main(process.argv.slice(2)).catch((error: unknown) => {
    console.error(error instanceof Error ? error.message : error)
    process.exit(1)
  })
}

/** A built entry point, e.g. `builtServerFile('start')` → dist/server/start.js. */
export const builtServerFile = (entry: keyof typeof SERVER_ENTRIES) => join(SERVER_OUT, `${entry}.js`)
