// The second API run: every API test file against PostgreSQL (TEST_DATABASE_URL, a fresh database per
// file), plus the PostgreSQL-only checks here and the two-instance test. Run by tests/api-pg/with-postgres.sh.
import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vitest/config'

const root = fileURLToPath(new URL('../..', import.meta.url))
const alias = {
  '@': fileURLToPath(new URL('../../src', import.meta.url)),
  '@shared': fileURLToPath(new URL('../../shared', import.meta.url)),
}

/** Checks of the SQLite file itself; their PostgreSQL counterparts are in tests/api-pg/database.test.ts. */
const SQLITE_ONLY_TESTS = ['reports its version and a healthy SQLite database']

export default defineConfig({
  root,
  resolve: { alias },
  test: {
    testNamePattern: new RegExp(`^(?!.*(${SQLITE_ONLY_TESTS.join('|')})).*$`),
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'api-pg',
          root,
          environment: 'node',
          include: ['tests/api/**/*.test.ts', 'tests/api-pg/**/*.test.ts'],
          exclude: ['tests/api/database.test.ts'],
          // Two files at a time (Vitest's default on 2 cores is one): the database server works meanwhile.
          maxWorkers: 2,
          // Projects with different worker counts must run as separate groups: these first, then scale.
          sequence: { groupOrder: 0 },
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'scale',
          root,
          // After the api-pg files, one at a time: each file starts two app instances.
          sequence: { groupOrder: 1 },
          environment: 'node',
          include: ['tests/scale/**/*.test.ts'],
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
})
