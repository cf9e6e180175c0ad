// Where the application's files are, found from this module whether it runs from source
// (server/infrastructure/) or bundled (dist/server/): the nearest folder above holding package.json.
import { existsSync } from 'node:fs'
import { dirname, join } from 'node:path'
import { fileURLToPath } from 'node:url'

function applicationRoot(from: string): string {
  for (let dir = from; ; dir = dirname(dir)) {
    if (existsSync(join(dir, 'package.json'))) return dir
    if (dirname(dir) === dir) throw new Error(`no package.json above ${from}`)
  }
}

export const APP_ROOT = applicationRoot(dirname(fileURLToPath(import.meta.url)))
/** The shipped exercises, imported into the database at start. */
export const SCENARIOS_DIR = join(APP_ROOT, 'scenarios')
/** The built client the production server serves. */
export const CLIENT_DIR = join(APP_ROOT, 'dist/client')
/** The sample attempt logs the demo centre is seeded with. */
export const ATTEMPT_FIXTURES_DIR = join(APP_ROOT, 'tests/fixtures/attempts')
