// Runs the real server (server/index.ts) as a child process on a free loopback port, as an operator would,
// and stops it with SIGTERM; for tests that need several independent API instances.
import { spawn, type ChildProcess } from 'node:child_process'
import { createServer } from 'node:net'
import { fileURLToPath } from 'node:url'

const ROOT = fileURLToPath(new URL('../..', import.meta.url))

export interface ServerProcess {
  url: string
  port: number
  /** What the process printed (for failure messages). */
  output(): string
  stop(): Promise<void>
}

export function freeLoopbackPort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject()))
    })
  })
}

async function waitForHealth(url: string, child: ChildProcess, output: () => string, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with ${child.exitCode}:\n${output()}`)
    try {
      const response = await fetch(`${url}/api/health`)
      if (response.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 200))
  }
  throw new Error(`server at ${url} did not become healthy in ${timeoutMs} ms:\n${output()}`)
}

/** `env` is added to a minimal environment (PATH, HOME); the port and loopback host are chosen here. */
export async function startServerProcess(
  env: Record<string, string>,
  { timeoutMs = 60_000 } = {},
): Promise<ServerProcess> {
  const port = await freeLoopbackPort()
  // `node --import tsx` keeps the server in this one process, so SIGTERM reaches it directly.
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: ROOT,
    env: {
      PATH: process.env.PATH ?? '/usr/bin:/bin',
      HOME: process.env.HOME ?? '/tmp',
      TSX_TSCONFIG_PATH: 'tsconfig.node.json',
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      API_PORT: String(port),
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let log = ''
  child.stdout!.on('data', (chunk: Buffer) => (log += chunk.toString()))
  child.stderr!.on('data', (chunk: Buffer) => (log += chunk.toString()))
  const url = `http://127.0.0.1:${port}`
  const stop = async () => {
    if (child.exitCode !== null || child.signalCode !== null) return
    const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()))
    child.kill('SIGTERM')
    const forced = setTimeout(() => child.kill('SIGKILL'), 15_000)
    await exited
    clearTimeout(forced)
  }
  try {
    await waitForHealth(url, child, () => log, timeoutMs)
  } catch (error) {
    await stop()
    throw error
  }
  return { url, port, output: () => log, stop }
}
