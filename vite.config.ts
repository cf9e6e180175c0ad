/// <reference types="vitest/config" />
import { fileURLToPath, URL } from 'node:url'
import { defineConfig } from 'vite'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'

const alias = {
  '@': fileURLToPath(new URL('./src', import.meta.url)),
  '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
}

// The API listens here in development; Vite proxies /api to it so the browser sees one origin.
const apiPort = Number(process.env.API_PORT ?? 3001)

export default defineConfig({
  plugins: [vue(), vuetify({ autoImport: true })],
  resolve: { alias },
  server: {
    port: 5173,
    proxy: { '/api': { target: `http://127.0.0.1:${apiPort}`, changeOrigin: false } },
  },
  build: {
    outDir: 'dist/client',
    emptyOutDir: true,
    sourcemap: false,
    // The manifest lets the bundle benchmark measure what each route really loads.
    manifest: true,
    chunkSizeWarningLimit: 900,
  },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: 'unit',
          environment: 'node',
          // Vitest's default on a 2-core machine is one worker (cores − 1), leaving a core idle while
          // files start and import; the vitest parent itself is nearly idle.
          maxWorkers: 2,
          include: ['tests/unit/**/*.test.ts'],
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'api',
          environment: 'node',
          maxWorkers: 2,
          include: ['tests/api/**/*.test.ts', 'tests/api-pg/**/*.test.ts'],
          // Each file gets its own temporary database; argon2 hashing makes tests CPU-bound.
          testTimeout: 30_000,
          hookTimeout: 60_000,
        },
      },
      {
        plugins: [vue(), vuetify({ autoImport: true })],
        resolve: { alias },
        test: {
          name: 'component',
          environment: 'happy-dom',
          maxWorkers: 2,
          include: ['tests/component/**/*.test.ts'],
          setupFiles: ['tests/component/setup.ts'],
          // Mounting the Pixi panel under happy-dom takes seconds on a busy 2-core machine; a hang still fails.
          testTimeout: 15_000,
          // Vuetify ships .css imports that Node cannot load unless Vite transforms them.
          server: { deps: { inline: ['vuetify'] } },
        },
      },
      {
        resolve: { alias },
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          globalSetup: ['tests/e2e/global-setup.ts'],
          testTimeout: 120_000,
          hookTimeout: 180_000,
          // One browser at a time: two cores are shared with the server under test.
          fileParallelism: false,
        },
      },
    ],
  },
})
