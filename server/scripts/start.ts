// `npm start`: build the client if it is missing or older than its sources, then serve everything on one port
// (with the demo centre, unless NODE_ENV=production or DEMO says otherwise).
import { spawnSync } from 'node:child_process'
import { existsSync, readdirSync, statSync } from 'node:fs'
import { join, resolve } from 'node:path'

const root = resolve(import.meta.dirname, '../..')
const builtIndex = join(root, 'dist/client/index.html')
const sources = ['src', 'shared', 'index.html', 'vite.config.ts', 'package.json', 'public']

function newestMtime(path: string): number {
  if (!existsSync(path)) return 0
  const stat = statSync(path)
  if (!stat.isDirectory()) return stat.mtimeMs
  return readdirSync(path).reduce(
    (newest, name) => Math.max(newest, newestMtime(join(path, name))),
    stat.mtimeMs,
  )
}

const builtAt = existsSync(builtIndex) ? statSync(builtIndex).mtimeMs : 0
const sourcesAt = Math.max(...sources.map((s) => newestMtime(join(root, s))))
if (builtAt < sourcesAt) {
  console.log(builtAt ? 'Client sources changed; rebuilding…' : 'Building the client…')
  const result = spawnSync(process.execPath, [join(root, 'node_modules/vite/bin/vite.js'), 'build'], {
    cwd: root,
    stdio: 'inherit',
  })
  if (result.status !== 0) process.exit(result.status ?? 1)
}

// `npm start` serves the demo; an operator's production start (NODE_ENV=production) never seeds its accounts.
process.env.DEMO ??= process.env.NODE_ENV === 'production' ? 'false' : 'true'
process.env.NODE_ENV ??= 'production'
const { startServer } = await import('../main')
await startServer({ mode: 'app' })
