// Browser tests need Chromium and a built client; both are prepared once per run.
import { buildClient, clientIsStale } from '../../scripts/build'
import { ensureChromium } from './support/chromium'

export default function setup() {
  ensureChromium()
  // `npm test` builds the client before Vitest starts; running this project alone builds it here, and so
  // does a checkout whose sources changed since the last build (a stale client tests yesterday's screens).
  if (clientIsStale()) {
    console.error('Building the client for the browser tests (sources changed since the last build)…')
    buildClient()
  }
}
