// Starts the real server (or the bare baseline) as a child process on loopback, waits until it answers,
// and stops it by its own PID. Used by the API benchmark and the durability test.
import { spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'

export const ROOT = fileURLToPath(new URL('../..', import.meta.url))
// tsx as a loader inside one node process (not its CLI, which runs the script in a second process):
// the PID is the server's own, so SIGKILL really kills the server and leaves no orphan behind.
const TSX = ['--import', 'tsx']

export interface ServerProcess {
  child: ChildProcess
  port: number
  url: string
  /** Everything the process wrote to stderr (for error reports). */
  stderr(): string
  /** SIGTERM (graceful) or SIGKILL (crash); resolves when the process has gone. */
  stop(signal?: 'SIGTERM' | 'SIGKILL'): Promise<void>
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      const port = typeof address === 'object' && address ? address.port : 0
      probe.close(() => resolve(port))
    })
  })
}

async function waitUntilUp(url: string, child: ChildProcess, stderr: () => string, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}:\n${stderr()}`)
    try {
      const response = await fetch(url, { signal: AbortSignal.timeout(1000) })
      if (response.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 150))
  }
  throw new Error(`server did not answer ${url} within ${timeoutMs} ms:\n${stderr()}`)
}

function launch(script: string, env: NodeJS.ProcessEnv, port: number, healthPath: string, timeoutMs: number) {
  const child = spawn(process.execPath, [...TSX, script], {
    cwd: ROOT,
    env: { ...process.env, TSX_TSCONFIG_PATH: 'tsconfig.node.json', ...env },
    stdio: ['ignore', 'ignore', 'pipe'],
  })
  let err = ''
  child.stderr!.on('data', (chunk: Buffer) => {
    err = (err + chunk.toString()).slice(-8000)
  })
  const url = `http://127.0.0.1:${port}`
  const stop = async (signal: 'SIGTERM' | 'SIGKILL' = 'SIGTERM') => {
    if (child.exitCode !== null || child.signalCode !== null) return
    const gone = new Promise<void>((resolve) => child.once('exit', () => resolve()))
    child.kill(signal)
    await gone
  }
  const proc: ServerProcess = { child, port, url, stderr: () => err, stop }
  return waitUntilUp(url + healthPath, child, () => err, timeoutMs).then(
    () => proc,
    async (error) => {
      await stop('SIGKILL')
      throw error
    },
  )
}

/** The production build: NODE_ENV=production, its own DATA_DIR, bound to 127.0.0.1 only. */
export async function startSlipway(
  dataDir: string,
  options: { port?: number; env?: NodeJS.ProcessEnv; timeoutMs?: number } = {},
): Promise<ServerProcess> {
  const port = options.port ?? (await freePort())
  const env = {
    NODE_ENV: 'production',
    PORT: String(port),
    HOST: '127.0.0.1',
    DATA_DIR: dataDir,
    PUBLIC_BASE_URL: `http://127.0.0.1:${port}`,
    LOG_LEVEL: 'warn',
    ...options.env,
  }
  return launch('server/index.ts', env, port, '/api/health', options.timeoutMs ?? 60_000)
}

/** The baseline: a bare Express 5 app answering `{}`, run the same way. */
export async function startBareExpress(): Promise<ServerProcess> {
  const port = await freePort()
  return launch('tests/bench/bare-server.ts', { PORT: String(port) }, port, '/', 30_000)
}
