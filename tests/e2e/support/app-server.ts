// Starts the built app (one port: API + client) on a free port with a fresh temporary data folder.
import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { startSlipway } from '../../support/server-process'

export { freePort } from '../../support/server-process'

export interface RunningApp {
  url: string
  dataDir: string
  output: () => string
  stop(): Promise<void>
}

/** The client must already be built into dist/client (the e2e global setup sees to it). */
export async function startApp(env: Record<string, string> = {}): Promise<RunningApp> {
  const dataDir = mkdtempSync(join(tmpdir(), 'slipway-e2e-data-'))
  try {
    const server = await startSlipway(dataDir, { env })
    return {
      url: server.url,
      dataDir,
      output: server.output,
      async stop() {
        await server.stop()
        rmSync(dataDir, { recursive: true, force: true })
      },
    }
  } catch (error) {
    rmSync(dataDir, { recursive: true, force: true })
    throw error
  }
}
