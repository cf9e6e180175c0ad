// The soak project (`npm run test:soak`): tests that start real server processes and take minutes,
// kept out of `npm test`.
import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'

export default defineConfig({
  resolve: { alias: { '@shared': fileURLToPath(new URL('../../shared', import.meta.url)) } },
  test: {
    name: 'soak',
    root: fileURLToPath(new URL('../..', import.meta.url)),
    environment: 'node',
    include: ['tests/reliability/**/*.test.ts'],
    testTimeout: 240_000,
    hookTimeout: 120_000,
    // Each file starts servers of its own; two cores are shared.
    fileParallelism: false,
  },
})
