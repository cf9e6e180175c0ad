// Runs the built server (or a benchmark baseline) as a child process on a free loopback port and stops it
// by its own PID. Shared by the browser tests, the benchmarks, the soak tests and the two-instance test.
// The server is what production runs: `node dist/server/<entry>.js`, rebuilt first when its sources changed.
import { spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'
import { builtServerFile, bundleFromSource, ensureServerBuild, SERVER_ENTRIES } from '../../scripts/build'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))
// An npm command's script that is not bundled (scenarios:check) runs from source through tsx, as `npm run` runs it.
const TSX = ['--import', 'tsx']

export interface ServerProcess {
  child: ChildProcess
  port: number
  url: string
  /** The last part of what the process printed (for failure messages). */
  output(): string
  /** SIGTERM (graceful) or SIGKILL (crash); resolves when the process has gone. */
  stop(signal?: 'SIGTERM' | 'SIGKILL'): Promise<void>
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject()))
    })
  })
}

async function waitUntilUp(url: string, child: ChildProcess, output: () => string, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}:\n${output()}`)
    try {
      const response = await fetch(url, { signal: AbortSignal.timeout(1000) })
      if (response.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 150))
  }
  throw new Error(`server did not answer ${url} within ${timeoutMs} ms:\n${output()}`)
}

interface LaunchOptions {
  /** A JavaScript file run by plain node (no loader): the PID is the server's own. */
  script: string
  env: NodeJS.ProcessEnv
  port: number
  healthPath: string
  timeoutMs: number
  cwd?: string
  /** Flags for node itself, e.g. --cpu-prof when profiling a benchmark. */
  nodeArgs?: string[]
}

export async function launch({
  script,
  env,
  port,
  healthPath,
  timeoutMs,
  cwd = ROOT,
  nodeArgs = [],
}: LaunchOptions): Promise<ServerProcess> {
  const child = spawn(process.execPath, [...nodeArgs, script], {
    cwd,
    env,
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let log = ''
  const keep = (chunk: Buffer) => {
    log = (log + chunk.toString()).slice(-20_000)
  }
  child.stdout!.on('data', keep)
  child.stderr!.on('data', keep)
  const stop = async (signal: 'SIGTERM' | 'SIGKILL' = 'SIGTERM') => {
    if (child.exitCode !== null || child.signalCode !== null) return
    const gone = new Promise<void>((resolve) => child.once('exit', () => resolve()))
    child.kill(signal)
    const forced = signal === 'SIGTERM' ? setTimeout(() => child.kill('SIGKILL'), 15_000) : undefined
    await gone
    clearTimeout(forced)
  }
  const url = `http://127.0.0.1:${port}`
  const server: ServerProcess = { child, port, url, output: () => log, stop }
  try {
    await waitUntilUp(url + healthPath, child, server.output, timeoutMs)
  } catch (error) {
    await stop('SIGKILL')
    throw error
  }
  return server
}

/**
 * The production build (API + built client): NODE_ENV=production, its own DATA_DIR, loopback only, with the
 * demo centre seeded into the empty database as `npm start` does (DEMO=true; pass DEMO: 'false' in `env` for a
 * plain production start).
 */
export async function startSlipway(
  dataDir: string,
  options: { port?: number; env?: NodeJS.ProcessEnv; timeoutMs?: number; nodeArgs?: string[] } = {},
): Promise<ServerProcess> {
  const port = options.port ?? (await freePort())
  const env = {
    ...process.env,
    NODE_ENV: 'production',
    PORT: String(port),
    HOST: '127.0.0.1',
    DATA_DIR: dataDir,
    PUBLIC_BASE_URL: `http://127.0.0.1:${port}`,
    LOG_LEVEL: 'warn',
    DEMO: 'true',
    ...options.env,
  }
  await ensureServerBuild()
  return launch({
    script: builtServerFile('start'),
    nodeArgs: options.nodeArgs ?? (process.env.BENCH_NODE_ARGS?.split(' ').filter(Boolean) || []),
    env,
    port,
    healthPath: '/api/health',
    timeoutMs: options.timeoutMs ?? 60_000,
  })
}

/**
 * An API instance as an operator would run one, with only `env` on top of a minimal environment
 * (PATH, HOME), so nothing from the test runner's own environment leaks in.
 */
export async function startServerProcess(
  env: Record<string, string>,
  { timeoutMs = 60_000 } = {},
): Promise<ServerProcess> {
  const port = await freePort()
  const fullEnv = {
    PATH: process.env.PATH ?? '/usr/bin:/bin',
    HOME: process.env.HOME ?? '/tmp',
    NODE_ENV: 'test',
    HOST: '127.0.0.1',
    API_PORT: String(port),
    ...env,
  }
  await ensureServerBuild()
  return launch({
    script: builtServerFile('index'),
    env: fullEnv,
    port,
    healthPath: '/api/health',
    timeoutMs,
  })
}

/** The benchmark baseline: a bare Express 5 app answering `{}`, bundled and run the same way. */
export async function startBareExpress(): Promise<ServerProcess> {
  const port = await freePort()
  return launch({
    script: await bundleFromSource('tests/bench/bare-server.ts'),
    env: { ...process.env, PORT: String(port) },
    port,
    healthPath: '/',
    timeoutMs: 30_000,
  })
}

/**
 * One of the npm commands' scripts (`server/scripts/…`) as an operator runs it: an operator command
 * (admin-create, db-reset) from its bundle with plain node, as `npm run` runs it (scripts/operator.mjs), built
 * first when stale; a minimal environment plus `env`, `input` on standard input. Resolves with the exit code
 * and everything it printed.
 */
export async function runScript(
  script: string,
  args: string[],
  { env = {}, input = '' }: { env?: Record<string, string>; input?: string } = {},
): Promise<{ code: number | null; out: string }> {
  const name = script.replace(/^server\/scripts\/(.*)\.ts$/, '$1')
  const bundled = name in SERVER_ENTRIES && name !== 'start'
  if (bundled) await ensureServerBuild()
  const command = bundled ? [builtServerFile(name as keyof typeof SERVER_ENTRIES)] : [...TSX, script]
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [...command, ...args], {
      cwd: ROOT,
      env: {
        PATH: process.env.PATH ?? '/usr/bin:/bin',
        TSX_TSCONFIG_PATH: 'tsconfig.node.json',
        LOG_LEVEL: 'silent',
        ...env,
      },
      stdio: ['pipe', 'pipe', 'pipe'],
    })
    let out = ''
    child.stdout!.on('data', (chunk: Buffer) => (out += chunk.toString()))
    child.stderr!.on('data', (chunk: Buffer) => (out += chunk.toString()))
    // A command that exits before reading its input (a refusal) closes the pipe: without a listener, that
    // EPIPE is an uncaught error that takes the whole test process down.
    child.stdin!.on('error', () => {})
    child.stdin!.end(input)
    child.on('close', (code) => resolve({ code, out }))
  })
}
