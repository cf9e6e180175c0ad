// The production entry point (bundled to dist/server/start.js, run by `npm start` through
// scripts/start.mjs): the whole app, API and built client, on one port.
export {}

// `npm start` serves the demo; an operator's production start (NODE_ENV=production) never seeds its accounts.
process.env.DEMO ??= process.env.NODE_ENV === 'production' ? 'false' : 'true'
process.env.NODE_ENV ??= 'production'
// Imported after NODE_ENV is set: the configuration reads it.
const { startServer } = await import('../main')
await startServer({ mode: 'app' })
