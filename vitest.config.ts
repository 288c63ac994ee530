import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

const alias = { '#shared': fileURLToPath(new URL('./shared', import.meta.url)) }

// Three projects: unit (pure functions), api (the built server on a real PostgreSQL) and e2e
// (a real Chromium through the users' journeys). `npm test` (scripts/test.mjs) prepares the
// database and the build first; see DEVELOPERS.md.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      { resolve: { alias }, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      { resolve: { alias }, test: { name: 'api', include: ['tests/api/**/*.test.ts'], environment: 'node', testTimeout: 30_000, hookTimeout: 60_000 } },
      { resolve: { alias }, test: { name: 'e2e', include: ['tests/e2e/**/*.test.ts'], environment: 'node', testTimeout: 60_000, hookTimeout: 90_000, fileParallelism: false } },
    ],
  },
})
