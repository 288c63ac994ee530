import { fileURLToPath } from 'node:url'
import { defineConfig } from 'vitest/config'

const alias = { '#shared': fileURLToPath(new URL('./shared', import.meta.url)) }

// Four projects: unit (pure functions), api (the built server on a real PostgreSQL), e2e (a real
// Chromium through the users' journeys) and reliability (load, faults, every route by every role). `npm test` (scripts/test.mjs) prepares the
// database and the build first; see DEVELOPERS.md.
export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      { resolve: { alias }, test: { name: 'unit', include: ['tests/unit/**/*.test.ts'], environment: 'node' } },
      { resolve: { alias }, test: { name: 'api', include: ['tests/api/**/*.test.ts'], environment: 'node', testTimeout: 30_000, hookTimeout: 60_000 } },
      { resolve: { alias }, test: { name: 'reliability', include: ['tests/reliability/**/*.test.ts'], environment: 'node', testTimeout: 180_000, hookTimeout: 180_000, fileParallelism: false } },
      { resolve: { alias }, test: { name: 'e2e', include: ['tests/e2e/**/*.test.ts'], environment: 'node', testTimeout: 60_000, hookTimeout: 90_000, fileParallelism: false } },
    ],
  },
})
