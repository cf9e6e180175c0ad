// Starts the built app (one port: API + client) on a free port with a fresh temporary data folder.
import { spawn, type ChildProcess } from 'node:child_process'
import { mkdtempSync, rmSync } from 'node:fs'
import { createServer } from 'node:net'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'

export interface RunningApp {
  url: string
  dataDir: string
  output: () => string
  stop(): Promise<void>
}

export async function freePort(): Promise<number> {
  return new Promise((resolvePort, reject) => {
    const probe = createServer()
    probe.once('error', reject)
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address()
      const port = typeof address === 'object' && address ? address.port : 0
      probe.close(() => resolvePort(port))
    })
  })
}

async function waitForHealth(url: string, child: ChildProcess, timeoutMs: number, output: () => string) {
  const deadline = Date.now() + timeoutMs
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`App exited with code ${child.exitCode}:\n${output()}`)
    try {
      const response = await fetch(`${url}/api/health`)
      if (response.ok) return
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250))
  }
  throw new Error(`App did not answer ${url}/api/health within ${timeoutMs} ms:\n${output()}`)
}

/**
 * Runs `server/index.ts` directly with tsx (not through npm, so the PID is the server's).
 * The client must already be built into dist/client (the e2e global setup sees to it).
 */
export async function startApp(env: Record<string, string> = {}): Promise<RunningApp> {
  const port = await freePort()
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-e2e-data-'))
  const url = `http://127.0.0.1:${port}`
  const tsx = resolve('node_modules/tsx/dist/cli.mjs')
  const child = spawn(process.execPath, [tsx, '--tsconfig', 'tsconfig.node.json', 'server/index.ts'], {
    env: {
      ...process.env,
      NODE_ENV: 'production',
      PORT: String(port),
      DATA_DIR: dataDir,
      PUBLIC_BASE_URL: url,
      LOG_LEVEL: 'warn',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let log = ''
  const keep = (chunk: Buffer) => {
    log = (log + chunk.toString()).slice(-20_000)
  }
  child.stdout?.on('data', keep)
  child.stderr?.on('data', keep)
  const output = () => log
  try {
    await waitForHealth(url, child, 60_000, output)
  } catch (error) {
    child.kill('SIGKILL')
    rmSync(dataDir, { recursive: true, force: true })
    throw error
  }
  return {
    url,
    dataDir,
    output,
    async stop() {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once('exit', r))
        child.kill('SIGTERM')
        const timer = setTimeout(() => child.kill('SIGKILL'), 5_000)
        await exited
        clearTimeout(timer)
      }
      rmSync(dataDir, { recursive: true, force: true })
    },
  }
}
