// The app version, from package.json.
import { readFileSync } from 'node:fs'
import { join } from 'node:path'
import { APP_ROOT } from './infrastructure/paths'

export const APP_VERSION: string = (
  JSON.parse(readFileSync(join(APP_ROOT, 'package.json'), 'utf8')) as { version: string }
).version
