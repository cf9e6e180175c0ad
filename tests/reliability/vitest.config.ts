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
    // The durability test, and the bad-input properties again with many more generated cases.
    include: ['tests/reliability/**/*.test.ts', 'tests/api/fuzz-*.test.ts'],
    testTimeout: 240_000,
    hookTimeout: 300_000,
    env: { FUZZ_RUNS: process.env.FUZZ_RUNS ?? '150' },
    // Each file starts servers of its own; two cores are shared.
    fileParallelism: false,
  },
})
