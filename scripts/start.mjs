// `npm start`: the built server (dist/server/start.js) with plain node, the client and server builds brought
// up to date first in a development checkout (scripts/built.mjs).
import { requireBuild } from './built.mjs'

requireBuild(['client', 'server'], ['dist/server/start.js', 'dist/client/index.html'])

await import('../dist/server/start.js')
