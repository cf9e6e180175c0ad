// Entry point: `tsx --tsconfig tsconfig.node.json server/index.ts` (the API alone in development,
// the whole app when NODE_ENV=production or SERVE_CLIENT=true).
import { startServer } from './main'

await startServer()
