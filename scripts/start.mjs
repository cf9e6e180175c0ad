// `npm start`: in a development checkout, bring the client and server builds up to date first; then run the
// built server with plain node. A production install (`npm ci --omit=dev`) has no build tools: the build made
// before the install is served as it is. Plain JavaScript, because nothing here may need a TypeScript loader.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

const at = (path) => fileURLToPath(new URL(`../${path}`, import.meta.url))
// A devDependency nothing else pulls in: present only where `npm install` (not --omit=dev) ran. (tsx, vite
// and esbuild can be present in a production install too, as peers of production dependencies.)
const developmentCheckout = existsSync(at('node_modules/@vitejs/plugin-vue/package.json'))

if (developmentCheckout) {
  const build = spawnSync(process.execPath, ['--import', 'tsx', at('scripts/build.ts'), '--if-stale'], {
    cwd: at(''),
    stdio: 'inherit',
    env: { ...process.env, TSX_TSCONFIG_PATH: at('tsconfig.node.json') },
  })
  if (build.status !== 0) process.exit(build.status ?? 1)
} else if (!existsSync(at('dist/server/start.js')) || !existsSync(at('dist/client/index.html'))) {
  console.error(
    'There is no build to run, and no build tools in this installation.\n' +
      'Build where every dependency is installed (npm ci && npm run build), then npm ci --omit=dev here.',
  )
  process.exit(1)
}

await import('../dist/server/start.js')
