// `npm start`: bring the builds up to date where the build tools are installed (a development checkout),
// then run the built server with plain node. After `npm ci --omit=dev` there are no build tools: the build
// made before the install is served as it is. Plain JavaScript, because nothing may need a TypeScript loader here.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const root = fileURLToPath(new URL('..', import.meta.url))
const at = (path) => fileURLToPath(new URL(path, new URL('..', import.meta.url)))
const buildTools = ['node_modules/tsx', 'node_modules/esbuild', 'node_modules/vite'].every((p) => existsSync(at(p)))

if (buildTools) {
  const build = spawnSync(process.execPath, ['--import', 'tsx', at('scripts/build.ts'), '--if-stale'], {
    cwd: root,
    stdio: 'inherit',
    env: { ...process.env, TSX_TSCONFIG_PATH: at('tsconfig.node.json') },
  })
  if (build.status !== 0) process.exit(build.status ?? 1)
} else if (!existsSync(at('dist/server/start.js')) || !existsSync(at('dist/client/index.html'))) {
  console.error(
    'There is no build to run, and the build tools are not installed (a production install).\n' +
      'Build first with every dependency installed (npm ci && npm run build), then npm ci --omit=dev.',
  )
  process.exit(1)
}

await import('../dist/server/start.js')
