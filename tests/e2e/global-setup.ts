// Browser tests need Chromium and a built client; both are prepared once per run.
import { execFileSync } from 'node:child_process'
import { existsSync } from 'node:fs'
import { resolve } from 'node:path'
import { ensureChromium } from './support/chromium'

export default function setup() {
  ensureChromium()
  // `npm test` builds the client before Vitest starts; running this project alone builds it here.
  if (!existsSync(resolve('dist/client/index.html'))) {
    execFileSync(process.execPath, [resolve('node_modules/vite/bin/vite.js'), 'build'], { stdio: 'inherit' })
  }
}
