// What `npm start` and the operator commands (`npm run admin:create`, `npm run db:reset`) share: they run a
// bundle of dist/server with plain node. In a development checkout the build is brought up to date first; a
// production install (`npm ci --omit=dev`) has no build tools, so the build made before the install is run
// as it is. Plain JavaScript, because nothing here may need a TypeScript loader.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

export const at = (path) => fileURLToPath(new URL(`../${path}`, import.meta.url))

// A devDependency nothing else pulls in: present only where `npm install` (not --omit=dev) ran. (tsx, vite
// and esbuild can be present in a production install too, as peers of production dependencies.)
export const developmentCheckout = existsSync(at('node_modules/@vitejs/plugin-vue/package.json'))

/**
 * Makes sure `files` (paths from the repository root) are built: rebuilds the stale `targets` (client,
 * server) in a development checkout; elsewhere exits with a message when one is missing.
 */
export function requireBuild(targets, files) {
  if (developmentCheckout) {
    const build = spawnSync(
      process.execPath,
      ['--import', 'tsx', at('scripts/build.ts'), ...targets, '--if-stale'],
      {
        cwd: at(''),
        stdio: 'inherit',
        env: { ...process.env, TSX_TSCONFIG_PATH: at('tsconfig.node.json') },
      },
    )
    if (build.status !== 0) process.exit(build.status ?? 1)
  } else if (!files.every((file) => existsSync(at(file)))) {
    console.error(
      'There is no build to run, and no build tools in this installation.\n' +
        'Build where every dependency is installed (npm ci && npm run build), then npm ci --omit=dev here.',
    )
    process.exit(1)
  }
}
